"""Checks: excitations, speed ranges, margins, the rule set, the interference check and vibration limits.

Shared by every kind of study; imports only :mod:`resonance.core` and :mod:`resonance.dynamics`. A new rule is a
scoped entry of :mod:`resonance.checks.rules`, never a branch inside one kind.
"""
