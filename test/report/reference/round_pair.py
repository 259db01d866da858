"""Reference for roundPair: GUM 7.2.6 rounding done with Python's decimal module.

Reads JSON [[value, uncertainty, digits], ...] on stdin, writes [[value_text, uncertainty_text], ...].
Each float is taken at its exact binary value (Decimal(float)) and rounded half up, which is the
rounding ECMAScript specifies for Number.prototype.toFixed and toExponential.
"""
import json
import sys
from decimal import ROUND_HALF_UP, Decimal, getcontext

getcontext().prec = 1000


def plain(d: Decimal) -> str:
    text = format(d, "f")
    if d == 0:
        text = text.lstrip("-")
    return text


def round_pair(value: float, uncertainty: float, digits: int):
    u = Decimal(uncertainty)
    lead = u.adjusted()
    scaled = u.scaleb(-(lead - (digits - 1))).quantize(Decimal(1), rounding=ROUND_HALF_UP)
    if scaled >= 10 ** digits:
        lead += 1
    last = lead - (digits - 1)
    step = Decimal(1).scaleb(last)
    return [plain(Decimal(value).quantize(step, rounding=ROUND_HALF_UP)), plain(u.quantize(step, rounding=ROUND_HALF_UP))]


cases = json.load(sys.stdin)
json.dump([round_pair(v, u, d) for v, u, d in cases], sys.stdout)
