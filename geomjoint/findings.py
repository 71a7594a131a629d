"""Every stable finding code, in one list: the scan's (geometry.scan) and the ones the
analysis adds when it resolves a model joint against the job.

A finding is ``{"severity": "fail" | "warn" | "info", "code": str, "message": str}`` in the
scan document and in results.json; scripts may rely on the codes, never on the messages.
README.md ("Finding codes") lists the same codes; a test keeps the three in step with the
source.
"""
from __future__ import annotations

from geomjoint.geometry.scan import FINDING_CODES as SCAN_FINDING_CODES

#: codes added when a model joint is resolved against the job (geomjoint.resolve), with what they mean
JOB_FINDING_CODES = {
    "job-model-mismatch": "warn: a [[fasteners]] rule sets another size than the modelled bolt (the job's is used); "
                          "info: [defaults] names another size than the modelled bolt (the model's is used)",
    "bearing-over-hole": "fail: the bearing face of the head or nut (or of the washer under it) is no wider than "
                         "the hole of the part it presses on: it would pull into the hole",
    "nut-not-modelled": "info: a through joint with a modelled bolt has no modelled nut: a catalogue hex nut is assumed",
    "not-analysed": "fail: the joint could not be sized or resolved (no size, no standard length, no hardware data "
                    "for its size, a hole or seat the bolt does not fit); the message says why, the other joints "
                    "are checked",
}

#: codes the analysis adds about the member-stiffness methods of a joint (geomjoint.analysis)
STIFFNESS_FINDING_CODES = {
    "tapped-fit-bias": "warn: a tapped joint's member stiffness is the exponential (Wileman) fit, which reads "
                       "26-47 % high on tapped joints (docs/tapped_stiffness.md); info: the fit is only in the "
                       "side-by-side comparison",
    "tapped-method-spread": "a tapped joint's member-stiffness methods (frustum, VDI 2230-1 body, clipped cone, FE "
                            "where it ran) lie more than 10 % from its reference (the FE where it ran, else the "
                            "chosen value); the message names each with its deviation, the reason and the published "
                            "spread; warn: the joint's own k_m is among them, info: only other methods",
}

#: every finding code a scan or a check can give
FINDING_CODES = {**SCAN_FINDING_CODES, **JOB_FINDING_CODES, **STIFFNESS_FINDING_CODES}
