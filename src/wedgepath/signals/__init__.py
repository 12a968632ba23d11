"""Lead and lag across many signals: area matrices, cyclic order, rolling and streaming."""

__all__ = []
