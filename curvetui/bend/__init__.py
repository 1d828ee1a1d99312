"""The bend layer: fields, parse, evaluate (the verdict), record and messages."""
