"""Demo data: one invented plant with three invented machines and their reading history,
for a first look at a full machine page. Every name, place and number here is made up
(demo data, not measurements); the readings are real calc answers to those made-up
inputs, dated back from the day the demo is loaded.

Every demo record carries ``"demo": true`` so the page can remove the demo again without
touching the user's own machines.

>>> made = plant(date(2026, 12, 2))
>>> [m["card"]["name"] for m in made["machines"]]
['Press 6 (demo)', 'Mill 2 (demo)', 'Crane 9 (demo)']
>>> len(made["readings"]) > 20 and all(r["demo"] for r in made["readings"])
True
"""

from __future__ import annotations

from datetime import date, datetime, time, timedelta, timezone

from .records import new_machine, new_reading
from .revisions import first_rev

PLANT = "Alderbrook Components (demo plant)"
# The demo plant's clock: one hour east of UTC (an invented site, like everything here).
OFFSET = timezone(timedelta(hours=1))


def _stamp(day: date, hour: int, minute: int = 0) -> str:
    return datetime.combine(day, time(hour, minute), OFFSET).isoformat()


def _ago(today: date, days: int) -> str:
    return (today - timedelta(days=days)).isoformat()


def _cards(today: date) -> list[dict]:
    return [
        {"name": "Press 6 (demo)", "site": PLANT + ", Hall B", "oil_name": "Invented HM 46",
         "grade": "VG 46", "vi": "102", "an_new": "0.45", "oil_family": "mineral-aw",
         "density": "872", "tank_shape": "rectangular", "tank_length": "1600",
         "tank_width": "900", "tank_height": "800", "working_level": "620",
         "low_level": "480", "application": "industrial", "pump_type": "piston",
         "pump_flow": "180", "pump_min_inlet": "0.8", "visc_start": "1000",
         "visc_opt_high": "36", "visc_opt_low": "16", "visc_min": "10",
         "suction_bore": "63", "suction_length": "1.2", "suction_head": "0.4",
         "entry": "sharp", "elbows_90": "2", "suction_valve": "full_bore",
         "strainer": "0.05", "strainer_bypass": "yes", "bypass_opens": "0.2",
         "working_pressure": "250", "component": "piston", "temp_cold_start": "12",
         "temp_running": "50", "temp_hottest": "62", "ambient": "24",
         "sample_days": "90", "filter_days": "180", "filter_changed": _ago(today, 150),
         "oil_days": "1460", "oil_changed": _ago(today, 720),
         "notes": "Demo machine. Breather replaced with a desiccant type last spring."},
        {"name": "Mill 2 (demo)", "site": PLANT + ", Cell 3", "oil_name": "Invented HM 32",
         "grade": "VG 32", "vi": "98", "an_new": "0.3", "oil_family": "mineral-aw",
         "tank_shape": "vertical", "tank_diameter": "700", "tank_height": "900",
         "working_level": "700", "low_level": "600", "application": "industrial",
         "pump_type": "vane", "pump_flow": "40", "working_pressure": "70",
         "component": "servo", "temp_cold_start": "18", "temp_running": "42",
         "temp_hottest": "48", "ambient": "22", "sample_days": "60", "filter_days": "120",
         "filter_changed": _ago(today, 125), "oil_days": "1095",
         "oil_changed": _ago(today, 400), "notes": "Demo machine. Servo axes on the table."},
        {"name": "Crane 9 (demo)", "site": PLANT + ", yard", "oil_name": "Invented HV 46",
         "grade": "VG 46", "vi": "150", "an_new": "0.5", "oil_family": "mineral-aw",
         "tank_shape": "horizontal", "tank_diameter": "600", "tank_length": "900",
         "working_level": "450", "low_level": "330", "application": "mobile",
         "pump_type": "gear", "pump_flow": "90", "working_pressure": "210",
         "component": "valves", "temp_cold_start": "-15", "temp_running": "60",
         "temp_hottest": "75", "ambient": "10", "sample_days": "180", "filter_days": "365",
         "filter_changed": _ago(today, 400), "oil_days": "1460",
         "oil_changed": _ago(today, 1000),
         "notes": "Demo machine. Works outdoors; washed down weekly."},
    ]


# Each machine's readings: (days ago, hour, tool, typed inputs). The oil's facts come from
# the card; only the reading is typed, as at the machine.
_LAB = ("kv40_now", "an_now", "ppm")


def _lab(hour: int, temp: str, rows, more: tuple[str, ...] = ()) -> list:
    """Oil-condition lab reports: rows of (days ago, KV40, acid number, water ppm, then the
    inputs named in `more`)."""
    keys = _LAB + more
    return [(row[0], hour, "oil-condition",
             {"temp": temp, "oil": "mineral-aw", **dict(zip(keys, row[1:]))}) for row in rows]


_PRESS = [
    *_lab(9, "48", (
        (630, "46.3", "0.47", "80", "17", "15", "12", "96"),
        (540, "46.5", "0.50", "90", "17", "15", "12", "90"),
        (450, "46.9", "0.55", "110", "18", "16", "12", "82"),
        (360, "47.2", "0.58", "120", "18", "16", "13", "75"),
        (270, "47.6", "0.62", "140", "18", "16", "13", "66"),
        (180, "48.0", "0.68", "180", "19", "17", "14", "58"),
        (90, "48.4", "0.74", "240", "19", "17", "14", "49"),
    ), more=("code4", "code6", "code14", "reserve")),
    *[(days, 10, "water-in-oil", {"reading": "rh", "rh": rh, "temp": t})
      for days, rh, t in ((75, "22", "51"), (45, "27", "52"), (15, "31", "50"), (1, "34", "53"))],
    *[(days, 11, "viscosity-at-temperature", {"temp": t})
      for days, t in ((60, "52"), (30, "55"), (1, "58"))],
]
_MILL = [
    *[(days, 8, "iso-4406", {"count4": c4, "count6": c6, "count14": c14})
      for days, c4, c6, c14 in ((300, "420", "110", "9"), (240, "610", "150", "14"),
                                (180, "900", "240", "22"), (120, "1500", "400", "35"),
                                (60, "1200", "330", "30"), (5, "2100", "560", "48"))],
    *_lab(9, "40", ((240, "32.2", "0.32", "60"), (120, "32.5", "0.36", "70"),
                    (5, "32.9", "0.41", "85"))),
]
_CRANE = [
    *_lab(14, "55", ((560, "45.8", "0.52", "150", "20", "18", "15"),
                     (380, "45.1", "0.58", "260", "20", "18", "15"),
                     (200, "44.0", "0.66", "410", "20", "18", "15"),
                     (20, "43.2", "0.72", "620", "20", "18", "15")),
          more=("code4", "code6", "code14")),
    (20, 15, "foam-air-tests", {"air_release": "14", "seq1_tendency": "120",
                                "seq1_stability": "0"}),
    (2, 9, "water-in-oil", {"reading": "ppm", "ppm": "650", "temp": "35"}),
    (2, 9, "checklist-water", {"milky_oil": "yes", "washdown": "yes", "free_water": "yes",
                               "ppm": "650", "temp": "35"}),
    (2, 10, "checklist-aeration", {}),
]


def plant(today: date) -> dict:
    """The demo plant as records: ``{"machines", "readings"}``, every one marked demo."""
    made = _cards(today)
    stamp = _stamp(today, 8)
    machines = [first_rev({**new_machine(card, "metric", stamp), "demo": True})
                for card in made]
    readings = []
    for machine, history in zip(machines, (_PRESS, _MILL, _CRANE)):
        for days, hour, tool_id, typed in history:
            # Demo readings give what each visit measured; the rest are the tools' examples.
            record = new_reading(tool_id, typed, "metric", machine,
                                 _stamp(today - timedelta(days=days), hour),
                                 examples=True)["record"]
            readings.append(first_rev({**record, "demo": True}))
    return {"machines": machines, "readings": readings}
