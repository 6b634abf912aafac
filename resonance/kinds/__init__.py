"""The kinds of study, one sub-package each: its model, scenario tables, study flow and record view.

- :mod:`~resonance.kinds.support`: a machine on a lumped support (the base kind), with its what-if and variants;
- :mod:`~resonance.kinds.rotor`: a rotor on bearings (lateral whirl, critical speeds, unbalance response);
- :mod:`~resonance.kinds.torsion`: a torsional train (inertias, shafts, couplings, gear meshes);
- :mod:`~resonance.kinds.space`: rigid bodies in space on mounts, frames and soil;
- :mod:`~resonance.kinds.field`: field verification of a support model, beside the kind it verifies.

A kind imports core, dynamics, checks and records, its own modules, and no other kind (field verification alone
imports the support kind it verifies). Each kind's ``kind`` module is its entry in the study registry.
"""
