"""Batch mode: check thousands to millions of bends from a CSV file, in streamed chunks.

``columns`` names the input and result columns, ``numbers`` turns text columns into
checked numbers, ``chunk`` runs the engine on one chunk's columns, ``header`` reads and
checks the header row, ``output`` builds the written rows of one chunk, ``summary`` keeps
the counts and the worst bends, ``stream`` reads and writes whole files in bounded memory.
"""
