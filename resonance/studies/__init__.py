"""Studies: the one way in (load, run), the registry of kinds, and uncertainty studies.

Asks each kind for what it needs through the :class:`~resonance.records.outcome.StudyKind` protocol (its
``kind`` module); never imports a kind's internals. Fleets of scenario files are a command
(:mod:`resonance.fleet`): they write HTML records, which the presentation draws.
"""
