"""Planar regions of loops: signed area, winding numbers, Green region integrals, decomposition."""

__all__ = []
