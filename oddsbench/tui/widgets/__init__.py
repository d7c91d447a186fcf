"""The workbench's widgets: each shows one part of the document or of the figures."""
