"""Dynamics: single- and many-degree-of-freedom models, damping, modes, receptance and batched variants.

SI floats in, named results out; imports only :mod:`resonance.core`. No rule, scenario or figure here.
"""
