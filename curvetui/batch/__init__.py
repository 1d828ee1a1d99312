"""Batch mode: check thousands to millions of bends from a CSV file, in streamed chunks.

``columns`` names the input and result columns, ``numbers`` turns text columns into
checked numbers, ``chunk`` runs the engine on one chunk's columns, ``stream`` reads and
writes whole files in bounded memory.
"""
