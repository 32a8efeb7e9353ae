"""
The same computations as `tests/bench/engine.bench.ts`, through CoolProp's low-level interface
(AbstractState, HEOS backend: nitrogen by Span et al. 2000, the equation of state our engine
implements). Run by `npm run bench` when Python can import CoolProp; prints one JSON object of
median microseconds per computation, and the figures, so the two engines are compared in one run.
Reference library: CoolProp (Bell et al. 2014, Ind. Eng. Chem. Res. 53(6), 2498-2508).
"""
import json
import sys
import time

import CoolProp.CoolProp as CP

gas = CP.AbstractState('HEOS', 'Nitrogen')
PSI = 6894.757293168361  # NIST SP 811, B.8
AMBIENT = 101325.0  # ISA sea level
INCH3 = 1.6387064e-05  # NIST SP 811, B.8


def absolute(psig):
    return psig * PSI + AMBIENT


def kelvin(celsius):
    return celsius + 273.15


def density(p, t):
    gas.update(CP.PT_INPUTS, p, t)
    return gas.rhomass()


def pressure(rho, t):
    gas.update(CP.DmassT_INPUTS, rho, t)
    return gas.p()


def charge_target(index):
    """Reference 1500 psig at 21 °C brought to the gas temperature at constant volume."""
    rho = density(absolute(1500), kelvin(21))
    return pressure(rho, kelvin(-40 + index % 100))


def size(operating_c):
    """Pre-charge 1500 psig at 21 °C; isothermal charge to 3000 psig; isentropic discharge to 1800 psig."""
    filled = density(absolute(1500), kelvin(21))
    t = kelvin(operating_c)
    gas.update(CP.DmassT_INPUTS, filled, t)
    gas.update(CP.PT_INPUTS, absolute(3000), t)
    at_max = gas.rhomass()
    entropy = gas.smass()
    gas.update(CP.PSmass_INPUTS, absolute(1800), entropy)
    at_min = max(gas.rhomass(), filled)
    return filled, at_max, at_min, entropy


def usable_volume(index):
    """120 in³ of gas, 3 in³ per application: usable volume, applications and the pressure after the last."""
    filled, at_max, at_min, entropy = size(-40 + index % 90)
    gas_m3 = 120 * INCH3
    usable = (filled / at_min - filled / at_max) * gas_m3
    applications = int(usable / (3 * INCH3) * (1 + 1e-12) + 1e-12)
    after = filled * gas_m3 / (filled / at_max * gas_m3 + applications * 3 * INCH3)
    gas.update(CP.DmassSmass_INPUTS, after, entropy)
    return usable + gas.p() * 0


def required_volume(index):
    """The gas volume that delivers 40 in³ under the same conditions."""
    filled, at_max, at_min, _ = size(-40 + index % 90)
    return 40 * INCH3 / (filled / at_min - filled / at_max)


def leak_rate(index):
    """Pre-charge 1500 psig at 21 °C; cut-out 3000, cut-in 2700 psig at the check temperature; 120 in³."""
    t = kelvin(-20 + index % 60)
    mass = density(absolute(1500), kelvin(21)) * 120 * INCH3
    pressure(mass / (120 * INCH3), t)
    at_cut_out = mass / density(absolute(3000), t)
    at_cut_in = mass / density(absolute(2700), t)
    return (at_cut_in - at_cut_out) / INCH3 / 10


def measure(work, batch, batches=41):
    for index in range(batch * 3):
        work(index)
    per_call = []
    for _ in range(batches):
        start = time.perf_counter_ns()
        for index in range(batch):
            work(index)
        per_call.append((time.perf_counter_ns() - start) / 1000 / batch)
    per_call.sort()
    return per_call[len(per_call) // 2]


if __name__ == '__main__':
    print(json.dumps({
        'library': f'CoolProp {CP.get_global_param_string("version")} (Python {sys.version.split()[0]})',
        'microseconds': {
            'chargeTarget': measure(charge_target, 400),
            'usableVolume': measure(usable_volume, 100),
            'requiredVolume': measure(required_volume, 100),
            'leakRate': measure(leak_rate, 200),
        },
        'figures': {
            'chargeTargetAtMinus40Psig': (charge_target(0) - AMBIENT) / PSI,
            'usableVolumeAt0In3': usable_volume(40) / INCH3,
            'leakRateAt0In3PerMin': leak_rate(20),
        },
    }))
