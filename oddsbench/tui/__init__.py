"""The terminal workbench (Textual). The engines do every computation; this package shows it.

Only ``app.create_app`` is the way in, for the CLI, the tests and the screenshot script alike.
Modules without a Textual import (``analysis``, ``editing``, ``templates``, ``bundled``) hold
the workbench's logic so that it can be tested and reused without a terminal.
"""
