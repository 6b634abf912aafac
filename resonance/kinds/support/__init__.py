"""The support kind: a machine on a lumped support (masses, springs with dashpots).

Its scenario tables, study, record, what-if fixes and the batched variants used by uncertainty studies.
"""
