"""Derive modules: read the design, call the physics, publish named quantities.

Each module has ``QUANTITIES`` (what it may publish, declared with unit and label) and
``derive(ctx)``. They run in the order of :data:`MODULES`; a module may read what an earlier
one published with ``ctx.q(name)``.
"""

from reviewer.derive import (band, bootstrap, bus, gate, grounding, index, isolation, layout,
                             operating, protection, stress, switching, thermal, waveform)

MODULES = [operating, waveform, index, band, gate, switching, stress, thermal, bootstrap, bus, protection,
           isolation, layout, grounding]
