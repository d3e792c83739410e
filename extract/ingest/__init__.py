"""Ingest: article files (PDF, JATS XML) to the :class:`~extract.ingest.document.Document` model."""
