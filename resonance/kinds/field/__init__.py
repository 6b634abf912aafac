"""Field data: reading measurements, identifying resonances and damping, comparing with the rules.

* :mod:`.readers`: coast-down / run-up and impact-test files, validated line by
  line (errors name the file, line and column), with logged safe repairs.
* :mod:`.coastdown`: resonances of a coast-down (peaks confirmed by the phase
  change), half-power AF, a least-squares modal fit of the complex response.
* :mod:`.impact`: H1 frequency response and coherence from triggered impact
  records with force and exponential windows; peak picking, circle fit,
  rational-fraction fit and a stability check across model orders.

Everything ends in the package's :class:`~resonance.dynamics.modes.Mode` (source
``"measured"``), so the interference check, records and plots work unchanged.
"""
