"""Project files: the model, reading and writing, and checking every bend."""
