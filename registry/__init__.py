"""The curated ingredient registry: HLB, required-HLB and density values with
their provenance, read from data files and validated on load.

This package knows nothing of Flask or of the HTTP service; the service
depends on it, never the other way round.
"""
from registry.errors import RegistryError
from registry.loader import DEFAULT_ROOT, load_registry
from registry.model import FunctionsRecord, Ingredient, Registry, Source, ValueRecord

__all__ = ["DEFAULT_ROOT", "FunctionsRecord", "Ingredient", "Registry", "RegistryError", "Source", "ValueRecord", "load_registry"]
