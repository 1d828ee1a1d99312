"""The pure computation engine: no Textual, no Rich, no file I/O.

Every function takes floats or numpy arrays alike and works in SI units inside
(metres, seconds, m/s, superelevation and cant as fractions or metres).
"""
