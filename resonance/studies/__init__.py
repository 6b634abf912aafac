"""Studies: the one way in (load, run), the registry of kinds, uncertainty studies and fleets.

Asks each kind for what it needs through the :class:`~resonance.records.outcome.StudyKind` protocol; never
imports a kind's internals.
"""
