"""curator: build themed reading and viewing lists from a linked-data catalogue."""

__version__ = "0.1.0"
