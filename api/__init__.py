"""clausewise: flexural strength of flanged concrete beams under interchangeable standards."""

__version__ = "0.1.0"
