"""The app's state, apart from any screen: the site and its undo history, which reading is
the given, the values as fields show them, and the answer a solve gives."""
