"""Maintenance tools for contributors (not used by the studies themselves)."""
