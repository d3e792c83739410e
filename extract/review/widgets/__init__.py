"""The review app's widgets: the proposal's fields and its source (sentence or table grid)."""
