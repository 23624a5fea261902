"""Water properties of the library (IAPWS-IF97), for hosts that need the same numbers."""
import ctypes

from . import _capi


def water_saturation_pressure(temperature):
    """Saturation pressure of water, Pa, at 273.15 K <= T <= 647.096 K (IF97 eq. 30)."""
    p = ctypes.c_double()
    _capi.check(_capi.lib.ely_water_saturation_pressure(float(temperature), ctypes.byref(p)))
    return p.value


def water_electrolysis_voltages(temperature, pressure_anode, pressure_cathode):
    """(reversible, thermoneutral) cell voltage, V, of water splitting with liquid feed at stack
    temperature T (K) and absolute electrode pressures (Pa): Nernst with the wet gases' partial
    pressures; thermoneutral on the higher-heating-value basis."""
    reversible, thermoneutral = ctypes.c_double(), ctypes.c_double()
    _capi.check(_capi.lib.ely_water_electrolysis_voltages(float(temperature), float(pressure_anode),
                                                          float(pressure_cathode), ctypes.byref(reversible),
                                                          ctypes.byref(thermoneutral)))
    return reversible.value, thermoneutral.value
