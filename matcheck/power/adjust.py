"""The two adjustments no power library offers, each written once with its source.

- Pre-test as covariate (ANCOVA): with a pre-/post-test correlation ρ, adjusting for the
  pre-test leaves ``1 − ρ²`` of the error variance, so "ANCOVA comparing groups of
  (1 − ρ²)·n subjects has the same power as a t-test comparing groups of n subjects"
  (Borm, Fransen & Lemmens 2007, J Clin Epidemiol 60:1234–1238; docs/references.md §6.2).
  :mod:`matcheck.power.solve` computes ANCOVA power exactly from the noncentral t or F
  distribution with the error variance scaled by ``1 − ρ²`` and one error degree of freedom
  spent on the covariate; :func:`ancova_n` is the approximation, used to check it.
- Whole classes assigned (cluster randomisation): the variance of a condition mean grows by
  the design effect ``1 + (m − 1)·ICC`` for m learners per class (Donner & Klar 2000;
  docs/references.md §6.3), so n learners carry the information of ``n / deff``
  independent ones. Power is computed for the analysis of class means, whose error degrees
  of freedom count classes, not learners (:func:`class_mean_scale`);
  :func:`classes_needed` is the plain design-effect count, used to check it.
"""

from __future__ import annotations

import math


def residual_share(pretest_r: float | None) -> float:
    """The share of the error variance left after adjusting for the pre-test: ``1 − ρ²``."""
    return 1.0 if pretest_r is None else 1.0 - pretest_r**2


def ancova_n(n_unadjusted: float, pretest_r: float) -> float:
    """Borm et al. (2007): the n per group ANCOVA needs, from the t-test's n."""
    return n_unadjusted * (1.0 - pretest_r**2)


def design_effect(class_size: int, icc: float) -> float:
    """``1 + (m − 1)·ICC``: the variance inflation of assigning classes of m learners."""
    return 1.0 + (class_size - 1) * icc


def class_mean_scale(class_size: int | None, icc: float | None) -> float:
    """``√(m / deff)``: a difference in learner SDs, expressed in SDs of class means.

    A class mean of m learners has variance ``σ²·(ICC + (1 − ICC)/m) = σ²·deff/m``; with
    no classes assigned the scale is 1.
    """
    if class_size is None:
        return 1.0
    return math.sqrt(class_size / design_effect(class_size, icc or 0.0))


def classes_needed(learners: float, class_size: int, icc: float) -> int:
    """Classes per condition to match ``learners`` independent learners per condition."""
    return math.ceil(learners * design_effect(class_size, icc) / class_size)
