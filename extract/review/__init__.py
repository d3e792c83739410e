"""Curator review in the terminal: a Textual app over the store.

The curator accepts, edits, rejects, skips or adds data points; each decision is written to the
store as it is made. Every proposed value is a suggestion to verify against the article, never a
basis for clinical decisions on its own. See docs/review.md for the screens and keys.
"""

from extract.review.app import ReviewApp, key_groups
from extract.review.session import ReviewSession

__all__ = ["ReviewApp", "ReviewSession", "key_groups"]
