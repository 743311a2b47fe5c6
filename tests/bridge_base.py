"""A complete, clean design text for the gate, timing, thermal and bootstrap rule tests.

Invented values. Both gate loops are 2 Ω drive + 8 Ω series + 0 Ω internal = 10 Ω, the gate
is 2 nF / 10 nC Q_gd with V_th 3 V and a given 5 V plateau, driven 0 → 12 V: the same numbers
as the hand calculations in tests/physics/test_switching.py.
"""

SWITCH = """vds_rating = "40 V"
vgs_max = "20 V"
vth = "3 V"
rds_on = "10 mΩ"
rds_on_vgs = "10 V"
qg = "40 nC"
qgd = "10 nC"
ciss = "2 nF"
crss = "100 pF"
coss = "300 pF"
v_plateau = "5 V"
rg_internal = "0 Ω"
diode_vf = "0.8 V"
rth_ja = "40 K/W"
"""

DRIVE = """kind = "driver_ic"
on_level = "12 V"
off_level = "0 V"
r_source = "2 Ω"
r_sink = "2 Ω"
r_gate = "8 Ω"
pull_resistor = "10 kΩ"
"""

BASE = f"""[design]
title = "rule test bridge"

[source]
v_nom = "12 V"

[output]
frequency = "50 Hz"
v_rms = "8 V"

[load]
kind = "resistive"
power = "40 W"

[modulation]
kind = "spwm_bipolar"
index = 0.9
carrier = "20 kHz"

[timing]
dead_time = "500 ns"

[switch.high]
{SWITCH}
[switch.low]
{SWITCH}
[drive.high]
{DRIVE}
[drive.low]
{DRIVE}"""


def bridge(*edits: tuple[str, str, str]) -> str:
    """BASE with edits (table, key, TOML value); value None removes the key."""
    lines = BASE.splitlines()
    for table, key, value in edits:
        start = lines.index(f"[{table}]") if f"[{table}]" in lines else None
        if start is None:
            lines += ["", f"[{table}]", f"{key} = {value}"]
            continue
        end = next((i for i in range(start + 1, len(lines)) if lines[i].startswith("[")), len(lines))
        for i in range(start + 1, end):
            if lines[i].split("=")[0].strip() == key:
                if value is None:
                    del lines[i]
                else:
                    lines[i] = f"{key} = {value}"
                break
        else:
            if value is not None:
                lines.insert(start + 1, f"{key} = {value}")
    return "\n".join(lines) + "\n"
