"""winnow: a local first pass that turns biomedical articles into analysis-ready records.

Every value winnow proposes is a suggestion: a curator must verify it against the article before
it is used, and no extracted value is a basis for a clinical decision on its own.
"""

from extract.errors import WinnowError

__version__ = "0.1.0"

__all__ = ["WinnowError", "__version__"]
