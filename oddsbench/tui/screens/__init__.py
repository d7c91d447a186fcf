"""The workbench's screens: the main workbench and its dialogs."""
