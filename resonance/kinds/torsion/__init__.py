"""The torsional-train kind: inertias joined by shafts, couplings and gear meshes, referred to one shaft.

Its model, scenario tables, study and record.
"""
