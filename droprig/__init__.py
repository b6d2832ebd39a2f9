"""droprig: dropped-load assessment of floor framing under crane swing zones."""

__version__ = "0.1.0"
