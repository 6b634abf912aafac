"""Records: scenario tables every kind shares, the record's shared sections, and comparing two records.

Every kind feeds these pieces with data; imports only core, dynamics and checks.
"""
