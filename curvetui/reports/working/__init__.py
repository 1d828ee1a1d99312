"""A bend's calculation written out line by line: formula, substituted values, answer and
source, so a checker can redo every line on a calculator. Shared by the terminal app and
the worksheet.

Pure text from a bend's record (curvetui.bend.record): the engine's values and the
intermediates it records for this purpose; no computation of its own beyond the
arithmetic a checker would write beside a line. See ``text`` for how a line is written.
"""

from curvetui.reports.working.rail import rail_working
from curvetui.reports.working.road import road_working
from curvetui.reports.working.table import table_row_text
from curvetui.reports.working.text import Step

__all__ = ["Step", "rail_working", "road_working", "table_row_text"]
