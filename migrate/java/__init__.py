"""The Java front end: read and parse sources, index classes, classify roles, read drivers."""
