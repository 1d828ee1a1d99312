"""LandXML 1.2 horizontal alignments: reading (defusedxml, line numbers in every message),
writing, and the glue to a project file. See reader.py, writer.py and project_glue.py."""
