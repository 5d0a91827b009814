"""The explorer's widgets: plots, status pane, reactions table, point entry, bars."""
