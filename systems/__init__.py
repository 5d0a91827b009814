"""The shipped alloy systems, as data files (see FORMAT.md)."""
