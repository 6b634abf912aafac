"""Uncertainty studies: each stiffness, mass, damping and speed limit uncertain on its own.

A support scenario's ``[uncertainty]`` table gives each uncertain input a distribution of its factor on the
nominal value (every value is a factor, so ``1.0`` is the scenario as written)::

    [uncertainty]
    samples = 10000            # variants (a power of two for Sobol' sampling)
    sampling = "lhs"           # Latin hypercube ("lhs", default) or scrambled Sobol' ("sobol"), seeded
    seed = 20261203
    max_failure_probability = 0.05     # optional: the study fails above it (else reported only)
    inputs = [
      { vary = "spring:soil", distribution = "lognormal", median = 1.0, cov = 0.3 },
      { vary = "spring:mounting", distribution = "uniform", low = 0.8, high = 1.2 },
      { vary = "mass:machine", distribution = "normal", mean = 1.0, std = 0.05 },
      { vary = "damping_ratio", distribution = "uniform", low = 0.5, high = 1.5 },
      { vary = "speed_max", distribution = "uniform", low = 1.0, high = 1.05 },
    ]

``vary`` is ``spring:<label>``, ``mass:<name>``, ``damping_ratio``, ``speed_min`` or ``speed_max`` in a support
scenario; ``bearing:<label>:stiffness``, ``bearing:<label>:damping`` (every coefficient of that bearing, every
table value), ``speed_min`` or ``speed_max`` in a rotor scenario. A support scenario's variants are solved in
one batch; a rotor scenario's each run the whole rotor study (about 0.2 s for the demo fan), so take a few
hundred samples, or spread them over processes or a Dask cluster. A normal or
lognormal input may carry ``bounds = [low, high]`` (truncation; a normal factor is always kept above 0).
Every variant is checked by the scenario's rules, by its kind (the ``variant_findings`` of the
:class:`~resonance.records.outcome.StudyKind` protocol: a support's in one batched solve); the results
are the probability that each finding fails, the distribution of the worst margin, and a sensitivity ranking
of the inputs on the worst margin (first-order indices by RBD-FAST from SALib, which works on the same
Latin-hypercube sample; Tarantola et al. 2006, Plischke 2010). Samples are split into fixed chunks that an
executor (:mod:`resonance.core.executors`) may run anywhere: the result does not depend on where they ran.

Soil, mounts and supports are the least certain inputs; the distributions are the user's judgement and
the answer is only as good as they are.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np

from ..checks.variant_findings import VariantFindings
from ..core.errors import InputValueError
from ..core.executors import Executor, SerialExecutor, progress_bar
from ..records.tables import TableReader
from .registry import kind_of

__all__ = [
    "FACTOR_RANGE",
    "CHUNK",
    "UncertainInput",
    "UncertaintyResult",
    "UncertaintySpec",
    "evaluate_chunk",
    "run_uncertainty",
    "sample_inputs",
    "sensitivity_indices",
    "uncertainty_spec",
]

Distribution = Literal["uniform", "normal", "lognormal"]
Sampling = Literal["lhs", "sobol"]

#: Samples per chunk of work (fixed, so a result never depends on the executor).
CHUNK = 2048


#: The factors an uncertain input may take on its nominal value: far wider than any real scatter, they catch
#: a typing error (a factor of 1e300 makes the eigen-solver fail) before the study runs.
FACTOR_RANGE = (1e-3, 1e3)


@dataclass(frozen=True)
class UncertainInput:
    """One uncertain factor on the nominal value of an input.

    Attributes
    ----------
    vary : str
        ``spring:<label>``, ``mass:<name>``, ``damping_ratio``, ``speed_min`` or ``speed_max``.
    distribution : {"uniform", "normal", "lognormal"}
        The factor's distribution.
    a, b : float
        ``low, high`` (uniform), ``mean, std`` (normal) or ``median, cov`` (lognormal: ``sigma =
        sqrt(ln(1 + cov^2))`` of the logarithm).
    bounds : tuple of float
        The factor is truncated to ``[low, high]`` (``(-inf, inf)`` for none; normal factors above 0).
    """

    vary: str
    distribution: Distribution
    a: float
    b: float
    bounds: tuple[float, float] = (-math.inf, math.inf)

    def __post_init__(self) -> None:
        # Never another distribution than the one named: an unknown name is refused, not replaced.
        if self.distribution not in ("uniform", "normal", "lognormal"):
            raise InputValueError(
                f"{self.vary}: distribution: got {self.distribution!r}; expected 'uniform', 'normal' or 'lognormal'"
            )
        for name, value in (("a", self.a), ("b", self.b)):
            if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
                raise InputValueError(f"{self.vary}: {name}: got {value!r}; expected a finite number")
        if self.distribution == "uniform" and not 0.0 < self.a < self.b:
            raise InputValueError(
                f"{self.vary}: a (low) {self.a!r}, b (high) {self.b!r}; expected 0 < a < b for a uniform factor"
            )
        if self.distribution != "uniform" and not (self.a > 0.0 and self.b > 0.0):
            raise InputValueError(f"{self.vary}: a {self.a!r}, b {self.b!r}; expected a > 0 and b > 0")
        low, high = self.bounds
        if not low < high:
            raise InputValueError(f"{self.vary}: bounds: got {self.bounds!r}; expected low below high")

    def _frozen(self) -> Any:
        import scipy.stats  # only when sampling: it takes half a second to import

        if self.distribution == "uniform":
            return scipy.stats.uniform(self.a, self.b - self.a)
        if self.distribution == "normal":
            return scipy.stats.norm(self.a, self.b)
        return scipy.stats.lognorm(math.sqrt(math.log1p(self.b**2)), scale=self.a)

    def ppf(self, u: np.ndarray) -> np.ndarray:
        """Factors from uniform numbers in (0, 1) (the inverse of the truncated distribution).

        Parameters
        ----------
        u : numpy.ndarray
            Uniform numbers in (0, 1).

        Returns
        -------
        numpy.ndarray
            The factors.

        Raises
        ------
        Nothing
            The input is validated.
        """
        frozen = self._frozen()
        low, high = self.bounds
        if self.distribution == "normal":
            low = max(low, 0.0)
        lo = frozen.cdf(low) if math.isfinite(low) else 0.0
        hi = frozen.cdf(high) if math.isfinite(high) else 1.0
        return np.asarray(frozen.ppf(lo + np.asarray(u) * (hi - lo)), dtype=float)

    @property
    def words(self) -> str:
        """The distribution in words (``"lognormal, median 1, cov 0.3"``)."""
        names = {"uniform": ("low", "high"), "normal": ("mean", "std"), "lognormal": ("median", "cov")}[
            self.distribution
        ]
        text = f"{self.distribution}, {names[0]} {self.a:g}, {names[1]} {self.b:g}"
        if any(math.isfinite(x) for x in self.bounds):
            text += f", bounds [{self.bounds[0]:g}, {self.bounds[1]:g}]"
        return text


@dataclass(frozen=True)
class UncertaintySpec:
    """A validated ``[uncertainty]`` table.

    Attributes
    ----------
    inputs : tuple of UncertainInput
        The uncertain factors.
    samples : int
        Number of variants.
    sampling : {"lhs", "sobol"}
        Latin hypercube or scrambled Sobol' sequence (:mod:`scipy.stats.qmc`).
    seed : int
        Seed of the sampler (the same seed gives the same samples).
    max_failure_probability : float or None
        The study fails when the probability that any finding fails exceeds it.
    """

    inputs: tuple[UncertainInput, ...]
    samples: int = 4096
    sampling: Sampling = "lhs"
    seed: int = 0
    max_failure_probability: float | None = None

    def __post_init__(self) -> None:
        # Never another sampler than the one named, and never a study of nothing.
        if self.sampling not in ("lhs", "sobol"):
            raise InputValueError(f"sampling: got {self.sampling!r}; expected 'lhs' or 'sobol'")
        inputs = self.inputs
        if (
            not isinstance(inputs, (tuple, list))
            or not inputs
            or not all(isinstance(x, UncertainInput) for x in inputs)
        ):
            raise InputValueError(f"inputs: got {self.inputs!r}; expected one or more UncertainInput")
        if isinstance(self.samples, bool) or not isinstance(self.samples, int) or not 16 <= self.samples <= 1_000_000:
            raise InputValueError(f"samples: got {self.samples!r}; expected a whole number from 16 to 1000000")
        if self.sampling == "sobol" and self.samples & (self.samples - 1):
            raise InputValueError(f"samples: got {self.samples}; Sobol' sampling needs a power of two")
        if isinstance(self.seed, bool) or not isinstance(self.seed, int) or self.seed < 0:
            raise InputValueError(f"seed: got {self.seed!r}; expected a whole number >= 0")


def _sampled_kind(scenario: Any) -> Any:
    # The scenario's kind, which knows what may vary and how to check a block of variants (the protocol).
    kind = kind_of(scenario)
    if not hasattr(kind, "variant_findings"):
        raise InputValueError(
            f"uncertainty: the {kind.name} kind has no uncertainty study; expected a support or rotor"
        )
    return kind


def uncertainty_spec(table: Mapping[str, Any], scenario: Any, source: str = "<scenario>") -> UncertaintySpec:
    """Validate an ``[uncertainty]`` table against its scenario.

    Parameters
    ----------
    table : mapping
        The table as read from TOML.
    scenario : object
        The scenario whose springs and masses (or bearings) it names.
    source : str
        The file name errors start with.

    Returns
    -------
    UncertaintySpec

    Raises
    ------
    ScenarioError
        Any missing, unknown or invalid field, naming ``source`` and the field.
    """
    r = TableReader(source)
    r.known(table, ("samples", "sampling", "seed", "max_failure_probability", "inputs"), "uncertainty")
    samples = r.integer(table, "samples", "uncertainty.samples", 4096)
    if not 16 <= samples <= 1_000_000:
        raise r.fail("uncertainty.samples", f"got {samples}; expected 16 to 1000000 variants")
    sampling = r.text(table, "sampling", "uncertainty.sampling", "lhs")
    if sampling not in ("lhs", "sobol"):
        raise r.fail("uncertainty.sampling", f"got {sampling!r}; expected 'lhs' or 'sobol'")
    if sampling == "sobol" and samples & (samples - 1):
        raise r.fail("uncertainty.samples", f"got {samples}; Sobol' sampling needs a power of two (4096, 8192...)")
    seed = r.integer(table, "seed", "uncertainty.seed", 0)
    if seed < 0:
        raise r.fail("uncertainty.seed", f"got {seed}; expected a whole number >= 0")
    limit = None
    if "max_failure_probability" in table:
        limit = r.value(table["max_failure_probability"], "uncertainty.max_failure_probability", "ratio", "nonnegative")
        if not limit < 1.0:
            raise r.fail("uncertainty.max_failure_probability", f"got {limit:g}; expected a probability below 1")
    targets = _sampled_kind(scenario).uncertain_targets(scenario)
    inputs = []
    for i, item in enumerate(r.array(table, "inputs", "uncertainty.inputs")):
        field = f"uncertainty.inputs[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with vary and distribution")
        vary = r.text(item, "vary", f"{field}.vary")
        if vary not in targets:
            raise r.fail(f"{field}.vary", f"got {vary!r}; expected one of {targets}")
        kind = r.text(item, "distribution", f"{field}.distribution")
        keys = {"uniform": ("low", "high"), "normal": ("mean", "std"), "lognormal": ("median", "cov")}
        if kind not in keys:
            raise r.fail(f"{field}.distribution", f"got {kind!r}; expected one of {sorted(keys)}")
        r.known(item, ("vary", "distribution", *keys[kind], *(("bounds",) if kind != "uniform" else ())), field)
        a, b = (r.value(item.get(k), f"{field}.{k}", "ratio", "positive") for k in keys[kind])
        if kind == "uniform" and not a < b:
            raise r.fail(field, f"low {a:g} is not below high {b:g}")
        bounds = (-math.inf, math.inf)
        if "bounds" in item:
            raw = r.array(item, "bounds", f"{field}.bounds")
            if len(raw) != 2:
                raise r.fail(f"{field}.bounds", f"got {raw!r}; expected [low, high]")
            lo, hi = (r.value(x, f"{field}.bounds", "ratio", "positive") for x in raw)
            if not lo < hi:
                raise r.fail(f"{field}.bounds", f"got [{lo:g}, {hi:g}]; expected low below high")
            bounds = (lo, hi)
        inputs.append(UncertainInput(vary, kind, a, b, bounds))  # type: ignore[arg-type]
    if not inputs:
        raise r.fail("uncertainty.inputs", "empty; expected at least one uncertain input")
    names = [x.vary for x in inputs]
    if len(set(names)) != len(names):
        raise r.fail("uncertainty.inputs", f"{names} names an input twice; expected each at most once")
    spec = UncertaintySpec(tuple(inputs), samples, sampling, seed, limit)  # type: ignore[arg-type]
    # The extremes must make a valid scenario (a damping ratio below 1, a speed range that stays a range).
    extremes = sample_inputs(spec)
    for j, x in enumerate(spec.inputs):
        low, high = float(extremes[:, j].min()), float(extremes[:, j].max())
        if not (FACTOR_RANGE[0] <= low and high <= FACTOR_RANGE[1]):
            raise r.fail(
                f"uncertainty.inputs[{j}]",
                f"{x.vary}: its factors reach {low:.3g} to {high:.3g}; expected factors from {FACTOR_RANGE[0]:g} to "
                f"{FACTOR_RANGE[1]:g} of the nominal value (narrow the distribution or give bounds)",
            )
    try:
        evaluate_chunk(scenario, spec.inputs, np.vstack([extremes.min(axis=0), extremes.max(axis=0)]))
    except InputValueError as error:
        raise r.fail("uncertainty.inputs", str(error)) from None
    return spec


def sample_inputs(spec: UncertaintySpec) -> np.ndarray:
    """The factors of every variant, ``samples x inputs``, by the spec's seeded sampler.

    Parameters
    ----------
    spec : UncertaintySpec
        The validated spec.

    Returns
    -------
    numpy.ndarray

    Raises
    ------
    Nothing
        The spec is validated.
    """
    d = len(spec.inputs)
    from scipy.stats import qmc  # only when sampling: it takes half a second to import

    if spec.sampling == "sobol":
        u = qmc.Sobol(d, scramble=True, seed=spec.seed).random_base2(int(math.log2(spec.samples)))
    else:
        u = qmc.LatinHypercube(d, seed=spec.seed).random(spec.samples)
    return np.column_stack([x.ppf(u[:, j]) for j, x in enumerate(spec.inputs)])


def evaluate_chunk(scenario: Any, inputs: Sequence[UncertainInput], values: np.ndarray) -> VariantFindings:
    """The findings of a block of variants (one row of factors per variant).

    Parameters
    ----------
    scenario : object
        The nominal scenario.
    inputs : sequence of UncertainInput
        What each column varies.
    values : numpy.ndarray
        Factors, ``variants x inputs``.

    Returns
    -------
    VariantFindings
        Margins and required margins of every variant of the block.

    Raises
    ------
    InputValueError
        Factors that make an invalid variant (see the kind's ``variant_findings``).
    """
    return _sampled_kind(scenario).variant_findings(scenario, [x.vary for x in inputs], values)


@dataclass(frozen=True)
class UncertaintyResult:
    """What an uncertainty study gives.

    Attributes
    ----------
    spec : UncertaintySpec
        The study as specified.
    values : numpy.ndarray
        The sampled factors, ``samples x inputs``.
    findings : VariantFindings
        Every variant's findings.
    sensitivity : tuple of (str, float, float)
        Per input: its name, the first-order index of the worst margin and its 95 % confidence half-width
        (RBD-FAST, SALib), largest first.
    """

    spec: UncertaintySpec
    values: np.ndarray
    findings: VariantFindings
    sensitivity: tuple[tuple[str, float, float], ...]

    @property
    def failure_probability(self) -> np.ndarray:
        """Probability that each finding fails, ``modes x excitations``."""
        return np.mean(self.findings.failed, axis=0)

    @property
    def probability_any(self) -> float:
        """Probability that at least one finding fails (the machine does not meet its margins)."""
        return float(np.mean(self.findings.worst_excess < 0.0))

    @property
    def passed(self) -> bool:
        """False only when a ``max_failure_probability`` is given and exceeded."""
        limit = self.spec.max_failure_probability
        return limit is None or self.probability_any <= limit

    @property
    def standard_error(self) -> float:
        """Binomial standard error of :attr:`probability_any` (independent-sample estimate) [-]."""
        p, n = self.probability_any, self.values.shape[0]
        return math.sqrt(max(p * (1.0 - p), 1.0 / n) / n)

    def record_data(self) -> dict[str, Any]:
        """The study for a JSON record (SI; probabilities as fractions).

        Returns
        -------
        dict

        Raises
        ------
        Nothing
            Plain values.
        """
        spec = self.spec
        return {
            "samples": int(self.values.shape[0]),
            "sampling": spec.sampling,
            "seed": spec.seed,
            "inputs": [{"vary": x.vary, "distribution": x.words} for x in spec.inputs],
            "probability_any_failure": self.probability_any,
            "standard_error": self.standard_error,
            "max_failure_probability": spec.max_failure_probability,
            "failure_probability": [
                {"mode": mode, "excitation": excitation, "probability": p} for mode, excitation, p in self.rows()
            ],
            "sensitivity": [{"input": n, "first_order": s1, "confidence": c} for n, s1, c in self.sensitivity],
            "passed": self.passed,
            "summary": self.summary(),
            "method": ("Latin-hypercube" if spec.sampling == "lhs" else "scrambled Sobol'")
            + " sampling (scipy.stats.qmc), every variant checked by the scenario's rules; first-order indices "
            "by RBD-FAST (SALib; Tarantola et al. 2006, Plischke 2010)",
        }

    def rows(self) -> list[tuple[str, str, float]]:
        """Each finding with a non-zero probability of failing: mode, excitation, probability; largest first."""
        p = self.failure_probability
        rows = [
            (self.findings.mode_labels[i], self.findings.excitation_labels[j], float(p[i, j]))
            for i in range(p.shape[0])
            for j in range(p.shape[1])
            if p[i, j] > 0.0
        ]
        return sorted(rows, key=lambda row: -row[2])

    def summary(self) -> str:
        """The probability of failure, the worst margin's percentiles and the inputs that drive it.

        Returns
        -------
        str
            A few lines: P(fail), percentiles of the worst margin, the ranking.

        Raises
        ------
        Nothing
            Pure text.
        """
        worst = self.findings.worst_excess
        q05, q50, q95 = np.nanpercentile(worst, [5, 50, 95])
        limit = self.spec.max_failure_probability
        verdict = (
            "" if limit is None else (" (within" if self.passed else " (EXCEEDS") + f" the allowed {100 * limit:.1f} %)"
        )
        drivers = ", ".join(f"{name} {s1:.2f}" for name, s1, _ in self.sensitivity[:3])
        return (
            f"Probability that a margin fails: {100 * self.probability_any:.1f} % "
            f"(+/- {100 * self.standard_error:.1f} %, {self.values.shape[0]} {self.spec.sampling} samples, "
            f"seed {self.spec.seed}){verdict}\n"
            f"Worst margin minus required [percent points]: 5 % {q05:.1f}, median {q50:.1f}, 95 % {q95:.1f}\n"
            f"Drivers of the worst margin (first-order index): {drivers}"
        )


def sensitivity_indices(
    names: Sequence[str], values: np.ndarray, output: np.ndarray, seed: int = 0
) -> list[tuple[str, float, float]]:
    """First-order sensitivity indices of an output to each input, from one sample (RBD-FAST, SALib).

    Parameters
    ----------
    names : sequence of str
        The inputs' names.
    values : numpy.ndarray
        The inputs, ``samples x inputs`` (a Latin-hypercube or random sample).
    output : numpy.ndarray
        The output per sample (NaN samples are left out).
    seed : int
        Seed of the confidence bootstrap.

    Returns
    -------
    list of (str, float, float)
        Name, first-order index and its 95 % confidence half-width, largest index first.

    Raises
    ------
    ValueError
        Fewer samples than SALib needs.

    References
    ----------
    S. Tarantola, D. Gatelli and T. A. Mara, Random balance designs for the estimation of first order global
    sensitivity indices, Reliab. Eng. Syst. Saf. 91, 2006; E. Plischke, An effective algorithm for computing
    global sensitivity indices (EASI), Reliab. Eng. Syst. Saf. 95, 2010; J. Herman and W. Usher, SALib, JOSS
    2(9), 2017.
    """
    from SALib.analyze import rbd_fast

    keep = np.isfinite(output)
    problem = {
        "num_vars": len(names),
        "names": list(names),
        "bounds": [[float(values[:, j].min()), float(values[:, j].max())] for j in range(len(names))],
    }
    result = rbd_fast.analyze(problem, values[keep], output[keep], seed=seed)
    rows = [(n, float(s1), float(c)) for n, s1, c in zip(names, result["S1"], result["S1_conf"], strict=True)]
    return sorted(rows, key=lambda row: -row[1])


def run_uncertainty(
    scenario: Any,
    spec: UncertaintySpec,
    executor: Executor | None = None,
    progress: bool = False,
    on_progress: Callable[[int, int], None] | None = None,
) -> UncertaintyResult:
    """Sample, check every variant and rank the inputs.

    Parameters
    ----------
    scenario : object
        The nominal scenario.
    spec : UncertaintySpec
        From :func:`uncertainty_spec` (or built in code).
    executor : Executor, optional
        Where the chunks run (:func:`resonance.core.executors.executor_for`); this process if omitted. The result
        does not depend on it.
    progress : bool
        Show a progress bar over the chunks (terminal or notebook).
    on_progress : callable, optional
        Called as ``on_progress(done, total)`` after each chunk (a panel's own progress bar).

    Returns
    -------
    UncertaintyResult

    Raises
    ------
    InputValueError
        A spec whose extreme factors make an invalid variant.
    """
    values = sample_inputs(spec)
    chunks = [(scenario, spec.inputs, values[i : i + CHUNK]) for i in range(0, values.shape[0], CHUNK)]
    finished = [0]
    with progress_bar(len(chunks), "uncertainty", progress) as tick:

        def done() -> None:
            tick()
            finished[0] += 1
            if on_progress is not None:
                on_progress(finished[0], len(chunks))

        parts = (executor or SerialExecutor()).map(_chunk_findings, chunks, done)
    depth = max(p.margin.shape[1] for p in parts)

    def padded(a: np.ndarray) -> np.ndarray:
        # Rotor chunks may find different numbers of criticals: pad with NaN (no finding).
        if a.ndim < 2 or a.shape[1] == depth:
            return a
        pad = [(0, 0), (0, depth - a.shape[1])] + [(0, 0)] * (a.ndim - 2)
        return np.pad(a, pad, constant_values=np.nan)

    findings = VariantFindings(
        np.concatenate([padded(p.margin) for p in parts]),
        np.concatenate([padded(p.required) for p in parts]) if parts[0].required.ndim == 3 else parts[0].required,
        parts[0].mode_labels,
        parts[0].excitation_labels,
        np.concatenate([padded(p.frequency) for p in parts]),
    )
    if depth > len(parts[0].mode_labels):
        findings = dataclasses.replace(
            findings, mode_labels=tuple(f"critical {i + 1} (by speed)" for i in range(depth))
        )
    return UncertaintyResult(
        spec,
        values,
        findings,
        tuple(sensitivity_indices([x.vary for x in spec.inputs], values, findings.worst_excess, spec.seed)),
    )


def _chunk_findings(item: tuple[Any, Sequence[UncertainInput], np.ndarray]) -> VariantFindings:
    # Module-level, so process pools and Dask workers can import it.
    return evaluate_chunk(*item)
