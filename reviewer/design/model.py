"""The design model: everything a review needs to know about one H-bridge schematic.

Every quantity is SI inside (see :mod:`reviewer.units`); every table forbids unknown keys; the
model is immutable. Optional fields are ``None`` when the designer has not given them: a check
that needs one says so ("needs data") rather than guessing. Fields with a default state the
default and where it comes from in their description, and the calculation sheet marks them.
"""

from __future__ import annotations

from typing import Literal

from pydantic import BaseModel, ConfigDict, Field

from reviewer.design.fields import Q, Level, WireSize
from reviewer.units import Span

V, A, OHM, F, H, S, HZ, W = Q("V"), Q("A"), Q("Ω"), Q("F"), Q("H"), Q("s"), Q("Hz"), Q("W")
C, SIEMENS, M, DEGC, KW, RATIO, PCT, ANGLE = (
    Q("C"), Q("S"), Q("m"), Q("°C"), Q("K/W"), Q(""), Q("%"), Q("rad"),
)


def _x(v: float) -> Span:
    return Span(v, v, v)


class Part(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class Identity(Part):
    title: str = Field(description="What the design is, in a few words.")
    revision: str = Field("", description="Schematic revision the review is of.")
    author: str = ""
    date: str = ""
    notes: str = ""


class Source(Part):
    kind: Literal["battery", "bench_supply", "rectified_mains", "other"] = "battery"
    chemistry: Literal["lead_acid", "lithium_ion", "lifepo4", "nimh", "other"] | None = None
    v_nom: V = Field(description="Nominal bus voltage.")
    v_min: V | None = Field(None, description="Lowest bus voltage in service (end of discharge).")
    v_max: V | None = Field(None, description="Highest DC (mean) bus voltage in service (a "
                            "lead-acid battery charging sits near 14.4–14.8 V: common practice). "
                            "When not given it is taken from the chemistry (values from memory) "
                            "or the review asks for it.")
    r_internal: OHM | None = Field(None, description="Source internal resistance.")
    i_short: A | None = Field(None, description="Prospective short-circuit current of the source.")
    ripple: PCT | None = Field(None, description="Ripple of a DC source, rms over mean.")


class Output(Part):
    frequency: HZ = Field(description="Output (fundamental) frequency.")
    v_rms: V | None = Field(None, description="Target RMS output voltage.")
    v_tolerance: PCT = Field(_x(0.10), description="Allowed deviation of the RMS output "
                             "(default ±10 %: common practice).")
    thd_target: PCT = Field(_x(0.08), description="Target voltage THD after the filter "
                            "(default 8 %, EN 50160 / IEC 62040-3).")
    thd_orders: Literal["all", "40"] = Field(
        "all", description="Which components the THD target counts: 'all' resolved components "
        "(carrier groups included, the default) or harmonics to the '40'th (EN 50160).")
    transformer_ratio: RATIO | None = Field(None, description="Output transformer turns ratio, "
                                            "load side over bridge side, if there is one.")
    transformer_primary_resistance: OHM | None = Field(
        None, description="DC resistance of the transformer's bridge-side winding (with the "
        "filter inductor's in series), which alone limits a DC offset's current.")
    dc_offset: PCT = Field(_x(0.0), description="Largest mean voltage the controller may leave "
                           "across the bridge (timer or sensing imbalance), as a fraction of the "
                           "bus (default 0: only what the synthesis computes).")
    transformer_turns: RATIO | None = Field(None, description="Turns of the transformer's "
                                            "bridge-side winding, for the core flux.")
    transformer_core_area: Q("m²") | None = Field(None, description="Effective cross-section "
                                                  "of the transformer core, for the flux.")
    transformer_b_max: Q("T") | None = Field(None, description="Peak flux density the core "
                                             "takes before it saturates, at its working "
                                             "temperature.")
    transformer_dc_max: A | None = Field(
        None, description="DC current in the bridge-side winding the transformer tolerates "
        "before its core saturates (its maker's figure or a measurement).")


class Load(Part):
    kind: Literal["resistive", "r_l", "power_factor"] = "resistive"
    power: W | None = Field(None, description="Real power into the load at the target voltage.")
    resistance: OHM | None = None
    inductance: H | None = None
    power_factor: RATIO | None = None
    efficiency: PCT = Field(_x(0.85), description="Expected efficiency for input current "
                            "(default 85 %: common practice).")


class Modulation(Part):
    kind: Literal["square", "quasi_square", "spwm_bipolar", "spwm_unipolar",
                  "spwm_level_shifted"] = "square"
    notch_angle: ANGLE | None = Field(None, description="Quasi-square: zero-voltage half-angle "
                                      "each side of the zero crossing.")
    zero_state: Literal["low_sides", "phase_shifted"] = Field(
        "low_sides", description="Quasi-square: which switches hold the zero state. "
        "'low_sides': both low sides on in every zero interval (the high sides conduct for "
        "π − 2α per cycle; a bootstrap refreshes in every zero interval); 'phase_shifted': "
        "each leg a square wave, A leading and B lagging by α, the zero state alternating "
        "between both high sides and both low sides (every switch on for half a cycle).")
    index: RATIO | None = Field(None, description="Sine PWM: modulation index (peak of reference "
                                "over peak of carrier).")
    carrier: HZ | None = Field(None, description="Sine PWM: carrier (switching) frequency.")
    min_pulse: S | None = Field(None, description="Shortest pulse the controller emits.")
    regulated: bool = Field(False, description="The controller adjusts the modulation to hold "
                            "the output RMS against bus and load changes (closed loop).")


class Timing(Part):
    dead_time: S | None = Field(None, description="Dead time at every edge (0 is legal and dangerous).")
    dead_time_high: S | None = Field(None, description="Dead time before the high side turns on, "
                                     "if it differs.")
    dead_time_low: S | None = Field(None, description="Dead time before the low side turns on, "
                                    "if it differs.")
    enforced_in: Literal["hardware", "firmware", "driver", "none"] | None = None
    delay_mismatch: S | None = Field(None, description="Largest difference between the gate "
                                     "driver's high- and low-channel propagation delays "
                                     "(magnitude); it eats into the dead time at one edge.")
    delay_spread: S | None = Field(None, description="Further spread of propagation delay between "
                                   "the two channels' paths (separate drivers, isolators, "
                                   "temperature), beyond the driver's own mismatch (magnitude).")
    resolution: S | None = Field(None, description="Step of the controller's dead-time setting; "
                                 "the dead time made may be one step short of the value asked.")


class Switch(Part):
    polarity: Literal["n", "p"] = "n"
    count: int = Field(1, ge=1, le=32, description="Devices in parallel at this position.")
    own_gate_resistor: bool = Field(True, description="Each paralleled device has its own gate resistor.")
    vds_rating: V = Field(description="Drain-source voltage rating (magnitude).")
    vgs_max: V = Field(description="Gate-source voltage limit, either direction (magnitude).")
    vth: V | None = Field(None, description="Gate threshold, min/typ/max (magnitude).")
    rds_on: OHM | None = Field(None, description="On-resistance at rds_on_vgs and rds_on_temp.")
    rds_on_vgs: V | None = Field(None, description="Gate-source voltage R_DS(on) is specified at (magnitude).")
    rds_on_temp: DEGC = _x(25.0)
    rds_hot_factor: RATIO = Field(_x(1.7), description="R_DS(on) at rds_hot_temp over the value at "
                                  "rds_on_temp (default 1.7: common practice, parts range 1.4–2.2).")
    rds_hot_temp: DEGC = _x(125.0)
    qg: C | None = Field(None, description="Total gate charge.")
    qgs: C | None = Field(None, description="Gate-source charge, 0 V to the plateau.")
    qg_vgs: V | None = Field(None, description="Gate-source voltage the total gate charge qg is "
                             "given at (magnitude); when absent rds_on_vgs is taken.")
    qgd: C | None = Field(None, description="Gate-drain (Miller) charge.")
    ciss: F | None = None
    crss: F | None = None
    coss: F | None = None
    rg_internal: OHM | None = Field(None, description="Internal gate resistance. When absent, "
                                    "3 Ω is assumed for turn-off and dead-time figures and 0 Ω "
                                    "for edge speeds (each the conservative end; stated in the "
                                    "findings).")
    current_fall_time: S | None = Field(None, description="Datasheet fall time t_f, taken as the "
                                        "current-fall interval at turn-off (used for the turn-off "
                                        "overshoot instead of the gate-charge estimate).")
    common_source_inductance: H | None = Field(None, description="Inductance shared by the gate "
                                               "loop and the power path (source lead, bond wires, "
                                               "shared copper); it bounds the current edges.")
    vth_hot: V | None = Field(None, description="Lowest gate threshold at T_j,max (magnitude), "
                              "from the part's threshold-against-temperature curve.")
    gfs: SIEMENS | None = Field(None, description="Forward transconductance, for the Miller plateau.")
    v_plateau: V | None = Field(None, description="Miller plateau voltage, if known (magnitude).")
    diode_vf: V | None = Field(None, description="Body-diode forward voltage.")
    diode_trr: S | None = Field(None, description="Body-diode reverse-recovery time.")
    diode_qrr: C | None = Field(None, description="Body-diode reverse-recovery charge.")
    rth_jc: KW | None = None
    rth_cs: KW | None = None
    rth_sa: KW | None = None
    rth_ja: KW | None = Field(None, description="Junction to ambient, when there is no heatsink.")
    tj_max: DEGC = _x(150.0)
    zth_tau: S | None = Field(None, description="Thermal time constant of the junction-to-case "
                              "path (single-pole fit of the part's transient thermal impedance "
                              "Z_th,jc); enables the temperature swing of long on-times.")
    id_continuous: A | None = None
    id_pulse: A | None = Field(None, description="Pulsed drain current rating I_D,pulse.")
    sc_withstand: S | None = Field(None, description="Short-circuit withstand time.")


class DriveStage(Part):
    kind: Literal["controller_pin", "single_transistor", "push_pull", "driver_ic",
                  "bootstrap_driver", "isolated_driver", "charge_pump"]
    levels_from: Literal["source", "ground"] = Field(
        "source", description="Whether on_level and off_level are gate-to-source ('source') "
        "or gate-node voltages measured from circuit ground ('ground').")
    on_level: Level = Field(description="Gate level that turns the switch on.")
    off_level: Level = Field(description="Gate level that turns the switch off ('bus' allowed).")
    source_current: A | None = Field(None, description="Peak current the stage can source.")
    sink_current: A | None = Field(None, description="Peak current the stage can sink.")
    r_source: OHM | None = Field(None, description="Stage output resistance while turning on.")
    r_sink: OHM | None = Field(None, description="Stage output resistance while turning off.")
    r_gate: OHM = Field(_x(0.0), description="Series gate resistor.")
    r_gate_off: OHM | None = Field(None, description="Separate turn-off path resistance, if any.")
    pull_resistor: OHM | None = Field(None, description="Resistor that holds the gate off.")
    pull_to: Literal["source", "ground", "bus", "none"] = "source"
    pull_power_rating: W | None = None
    zener: V | None = Field(None, description="Gate-source zener clamp voltage.")
    uvlo: V | None = Field(None, description="Gate-supply undervoltage lockout threshold.")
    reference_negative_limit: V | None = Field(
        None, description="Bootstrap driver: how far (magnitude) its switch-node reference pin "
        "may be pulled below the driver's ground during an edge.")


class Drive(Part):
    shared_signal: bool = Field(False, description="One control signal feeds both switches of a "
                                "leg, one of them through an inverter.")
    high: DriveStage
    low: DriveStage


class Switches(Part):
    high: Switch
    low: Switch


class Bootstrap(Part):
    capacitor: F
    supply: V = Field(description="Gate-drive supply V_cc that charges the capacitor.")
    diode_vf: V = Field(_x(0.7), description="Bootstrap diode forward drop (default 0.7 V).")
    quiescent_current: A = Field(_x(200e-6), description="High-side driver quiescent current "
                                 "(default 200 µA, a conservative figure: common practice).")
    leakage_current: A = Field(_x(10e-6), description="Capacitor, diode and gate leakage "
                               "(default 10 µA: common practice).")
    diode_rating: V | None = Field(None, description="Bootstrap diode reverse-voltage rating.")
    series_resistance: OHM = Field(_x(1.0), description="Resistance in the bootstrap charging "
                                   "path, diode and any series resistor (default 1 Ω: common "
                                   "practice).")
    level_shift_charge: C = Field(_x(0.0), description="Level shifter charge per cycle.")


class Capacitors(Part):
    bulk: F | None = None
    local: F | None = Field(None, description="High-frequency capacitance across each leg.")
    voltage_rating: V | None = None
    ripple_rating: A | None = Field(None, description="Ripple current rating (rms), all in parallel.")
    esr: OHM | None = None
    kind: Literal["electrolytic", "polymer", "film", "ceramic"] = "electrolytic"


class Filter(Part):
    """The output LC filter, on the bridge side of any output transformer (taken as ideal)."""

    inductance: H | None = None
    inductor_isat: A | None = None
    inductor_dcr: OHM | None = Field(None, description="Winding (DC) resistance of the inductor; "
                                     "when not given the review assumes an inductor Q of 50 at "
                                     "the corner (common practice) and says so.")
    capacitance: F | None = None
    capacitor_voltage: V | None = None
    capacitor_esr: OHM | None = Field(None, description="Equivalent series resistance of the "
                                      "filter capacitor; when not given a capacitor Q of 200 at "
                                      "the corner is assumed (common practice for film).")
    capacitor_ripple_rating: A | None = Field(None, description="RMS current rating of the "
                                              "filter capacitor at its working frequency.")
    capacitor_kind: Literal["film", "ceramic", "electrolytic"] = "film"
    damping_resistance: OHM | None = None
    damping_capacitance: F | None = None


class Fuse(Part):
    rating: A
    voltage: V | None = None
    dc_rated: bool | None = None
    breaking: A | None = Field(None, description="Breaking (interrupting) capacity.")
    speed: Literal["fast", "medium", "slow"] | None = None
    standard: Literal["ul248", "iec60127", "automotive", "other"] = "other"
    distance: M | None = Field(None, description="Conductor length from the battery terminal.")
    i2t_melting: Q("A²s") | None = Field(None, description="Pre-arcing (melting) I²t of the fuse, "
                                         "from its data sheet.")
    i2t_clearing: Q("A²s") | None = Field(None, description="Total clearing I²t of the fuse at "
                                          "its rated voltage and breaking current.")
    ambient_factor: RATIO | None = Field(None, description="Fuse maker's rerating factor at the "
                                         "design's ambient temperature; when not given a typical "
                                         "curve for the fuse standard is used (from memory).")


class Wiring(Part):
    size: WireSize | None = Field(None, description="Supply conductor: '10 AWG' or '4 mm²'.")
    insulation_temp: DEGC = _x(75.0)
    length: M | None = None


class Protection(Part):
    reverse_polarity: Literal["none", "series_diode", "p_mosfet", "relay", "fuse_only"] | None = None
    overcurrent_threshold: A | None = Field(None, description="Current at which the overcurrent "
                                            "protection trips (peak switch or inductor current).")
    overcurrent_response: S | None = Field(None, description="Detection and turn-off time once "
                                           "the threshold is crossed.")
    overcurrent_blanking: S = Field(_x(0.0), description="Blanking time before the detector "
                                    "acts (default 0), added to the response.")
    precharge_resistance: OHM | None = Field(None, description="Series resistance that limits "
                                             "the inrush into the bulk capacitors on connection.")
    tvs_standoff: V | None = None
    tvs_clamp: V | None = None
    snubber: bool | None = None
    battery_uvlo: V | None = None
    thermal_shutdown: bool | None = None


class Isolation(Part):
    touchable: list[str] = Field(default_factory=list, description="Parts a person can touch.")
    protective_class: Literal["I", "II", "III"] | None = Field(
        None, description="Protective class the design declares (IEC 61140): I, protective earth "
        "on accessible conductive parts (basic insulation to them); II, double or reinforced "
        "insulation throughout; III, extra-low voltage only. Not given: class II is assumed.")
    touchable_earthed: bool = Field(False, description="Every touchable conductive part across "
                                    "the barrier is bonded to protective earth (class I), so the "
                                    "barrier is to earthed parts.")
    barrier_on_board: bool = Field(False, description="The barrier's creepage path lies on the "
                                   "printed board only (printed-wiring columns of IEC 60664-1).")
    insulation: Literal["none", "functional", "basic", "supplementary", "double",
                        "reinforced"] | None = Field(
        None, description="Insulation between the power side and what a person can touch: "
        "'double' is basic plus supplementary and counts as reinforced (IEC 61140).")
    working_voltage: V | None = None
    test_voltage: V | None = None
    creepage: M | None = None
    clearance: M | None = None
    pollution_degree: Literal[1, 2, 3, 4] = 2
    overvoltage_category: Literal["I", "II", "III", "IV"] = "II"
    material_group: Literal["I", "II", "IIIa", "IIIb"] = "IIIb"
    coating: bool = Field(False, description="The board carries a conformal coating over the "
                          "barrier (IEC 60664-3 treatment not applied: see the finding).")
    altitude: M = _x(0.0)


class Grounding(Part):
    scheme: Literal["single_point", "plane", "unspecified"] = "unspecified"
    gate_return: Literal["kelvin", "shared"] | None = None
    shunt: Literal["low_side", "high_side", "none"] | None = Field(
        None, description="Where the current shunt sits; on a bus beyond extra-low voltage its "
        "signal must cross the barrier (see shunt_isolated).")
    shunt_isolated: bool | None = Field(None, description="The shunt's signal reaches the "
                                        "controller through an isolated amplifier or sensor "
                                        "rated for the barrier.")
    protective_earth: bool | None = None
    enclosure: Literal["metal", "plastic", "none"] | None = None
    heatsink: Literal["insulated", "drain", "grounded", "none"] | None = None
    loop_inductance: H | None = Field(None, description="Commutation loop inductance estimate.")
    common_inductance: H | None = Field(None, description="Inductance shared by logic and power ground.")
    logic_noise_margin: V | None = None


class Layout(Part):
    copper_oz: float = Field(1.0, gt=0, le=10, description="Copper weight in oz/ft² (1 oz ≈ 35 µm).")
    temp_rise: DEGC = Field(_x(10.0), description="Allowed trace temperature rise.")
    layer: Literal["outer", "inner"] = "outer"


class Environment(Part):
    ambient: DEGC = Field(_x(25.0), description="Ambient temperature around the board.")


class Answer(Part):
    answer: Literal["yes", "no", "not_applicable"]
    note: str = ""


class Design(Part):
    """One H-bridge design, as described by its TOML file."""

    design: Identity
    source: Source
    output: Output
    load: Load = Load()
    modulation: Modulation = Modulation()
    timing: Timing = Timing()
    switch: Switches
    drive: Drive
    bootstrap: Bootstrap | None = None
    capacitors: Capacitors = Capacitors()
    filter: Filter = Filter()
    fuse: Fuse | None = None
    wiring: Wiring = Wiring()
    protection: Protection = Protection()
    isolation: Isolation = Isolation()
    grounding: Grounding = Grounding()
    layout: Layout = Layout()
    environment: Environment = Environment()
    checklist: dict[str, Literal["yes", "no", "not_applicable"] | Answer] = Field(
        default_factory=dict, description="Answers to the checklist questions, by question id.")
