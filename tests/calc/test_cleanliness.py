"""ISO 4406 codes, targets by component and pressure, filter beta ratios (ISO 16889)."""

import pytest

from calc import bridge
from calc.kernel.grading import pick
from calc.methods.cleanliness import (ABOVE_TABLE, SCALE_TABLE, beta_efficiency_pct, code_excess,
                                      downstream_count, format_code, iso4406_code, parse_code,
                                      scale_number, scale_range, worst_excess)
from calc.tools.cleanliness import CLEANLINESS_BANDS, filter_beta, iso_4406, target_code
from calc.kernel.errors import InputError


def _iso(**kw):
    args = dict(source="counts", count4=1850.0, count6=410.0, count14=52.0, scale4=None,
                scale6=None, scale14=None, component="piston", pressure=100.0)
    args.update(kw)
    return iso_4406(**args)


@pytest.mark.parametrize("count, number", [
    # ISO 4406 table 1 (from memory), as reproduced in a filter maker's handbook appendix
    # (ISO 4406:1999 table): 17 is >640 to 1300, 18 is >1300 to 2500, 19 is >2500 to 5000.
    (640.0, 16), (641.0, 17), (1300.0, 17), (1300.01, 18), (2500.0, 18), (2500.01, 19),
    (5000.0, 19), (0.64, 6), (0.65, 7), (1.3, 7), (1.31, 8), (0.01, 0), (0.0, 0),
    (2.5e6, 28), (2.5e6 + 1, ABOVE_TABLE),
])
def test_scale_number_boundaries(count, number):
    assert scale_number(count) == number


def test_every_table_bound_is_on_the_correct_side():
    # ISO 4406 table 1 headings: "more than" (exclusive) ... "up to and including".
    for number, low, high in SCALE_TABLE:
        assert scale_number(high) == number
        assert scale_number(high * (1 + 1e-9)) == number + 1
        if low > 0:
            assert scale_number(low) == number - 1
            assert scale_number(low * (1 + 1e-9)) == number


def test_table_is_contiguous_and_doubles():
    # ISO 4406:2021 clause 4.1: one code up generally represents a doubling; the table's
    # bounds are the series 2^n / 100 per mL rounded (within 7 % here).
    for (_n, _lo, high), (_m, low_next, _hi) in zip(SCALE_TABLE, SCALE_TABLE[1:]):
        assert high == low_next
    for number, _low, high in SCALE_TABLE:
        assert high == pytest.approx(2 ** number / 100.0, rel=0.07)


def test_worked_example_from_counts_per_100_ml():
    # Particle counter maker's explainer of ISO 4406: 300 000, 50 000 and 700 particles per
    # 100 mL at >=4, >=6, >=14 um(c) give the code 19/16/10.
    assert format_code(iso4406_code(300000 / 100, 50000 / 100, 700 / 100)) == "19/16/10"


def test_code_with_low_count_mark_reads_its_ranges():
    # ISO 4406 example as reproduced in a filter maker's handbook: 14/12/≥7 means >80 to 160
    # per mL at >=4 um(c), >20 to 40 at >=6 and >0.64 to 1.3 at >=14 um(c).
    code = parse_code("14/12/≥7")
    assert code == (14, 12, 7)
    assert [scale_range(n) for n in code] == [(80.0, 160.0), (20.0, 40.0), (0.64, 1.3)]


@pytest.mark.parametrize("number", range(0, 29))
def test_code_range_code_round_trip(number):
    # Definition of the table: any count inside a scale number's range codes to that number.
    low, high = scale_range(number)
    assert scale_number((low + high) / 2) == number
    assert scale_number(high) == number
    assert parse_code(format_code((number, number, number))) == (number, number, number)


def test_parse_code_forms():
    # ISO 4406: "-" for a size not counted; the two-number form is the >=6 and >=14 sizes.
    assert parse_code("-/16/13") == (None, 16, 13)
    assert parse_code("16/13") == (None, 16, 13)
    assert parse_code(">28/20/14") == (ABOVE_TABLE, 20, 14)
    assert format_code((None, 16, 13)) == "-/16/13"


@pytest.mark.parametrize("text", ["18/16/13/11", "abc", "18/19/13", "30/16/13", "18/1.5/1", "18/²/1"])
def test_parse_code_refuses_bad_codes(text):
    with pytest.raises(InputError) as err:
        parse_code(text, "code")
    assert err.value.field == "code"


def test_counts_must_be_cumulative():
    with pytest.raises(InputError) as err:
        iso4406_code(100.0, 200.0, 10.0)
    assert err.value.field == "count6"


@pytest.mark.parametrize("beta, efficiency", [(200.0, 99.5), (1000.0, 99.9), (2.0, 50.0),
                                              (75.0, 98.6667), (1.0, 0.0)])
def test_beta_efficiency(beta, efficiency):
    # ISO 16889 definition: efficiency = (1 - 1 / beta) * 100 %.
    assert beta_efficiency_pct(beta) == pytest.approx(efficiency, abs=1e-4)


def test_one_pass_count():
    # ISO 16889 definition of beta as upstream / downstream count.
    assert downstream_count(2500.0, 200.0) == pytest.approx(12.5)
    result = filter_beta(200.0, 2500.0)
    assert result.values["scale_before"] == "18" and result.values["scale_after"] == "11"


def test_measured_beta_below_rating_is_watched():
    assert filter_beta(200.0, 2500.0, 50.0).level == "watch"  # measured 50 < rated 200
    assert filter_beta(200.0, 2500.0, 10.0).level == "ok"
    with pytest.raises(InputError) as err:
        filter_beta(200.0, 2500.0, 0.0)
    assert err.value.field == "downstream"


@pytest.mark.parametrize("pressure, code", [
    # Common practice (from memory): one code cleaner above 140 bar, two above 210 bar.
    (100.0, (18, 16, 13)), (140.0, (18, 16, 13)), (140.1, (17, 15, 12)),
    (210.0, (17, 15, 12)), (210.1, (16, 14, 11)),
])
def test_target_steps_with_pressure(pressure, code):
    assert target_code("piston", pressure) == code


def test_targets_by_component_follow_sensitivity():
    # Common practice: servo valves need the cleanest oil, gear pumps tolerate the most.
    order = ["servo", "proportional", "piston", "gear", "valves"]
    codes = [target_code(c, 100.0) for c in order]
    assert codes[0] == (16, 14, 11) and codes[3] == (19, 17, 14)
    assert all(a <= b for a, b in zip(codes, codes[1:]))


def test_excess_levels():
    # Common practice: cleaner or equal ok, one code over watch, two or more act.
    assert code_excess((19, 16, None), (18, 16, 13)) == (1, 0, None)
    def level(excess):
        return pick(max(excess), CLEANLINESS_BANDS).level
    assert level((-2, -1, 0)) == "ok"
    assert level((1, 1, 1)) == "watch"
    assert level((0, 0, 2)) == "act"
    assert worst_excess((19, 16, None), (18, 16, 13)) == 1


@pytest.mark.parametrize("counts, level", [
    ((1850.0, 410.0, 52.0), "ok"),      # 18/16/13 on target 18/16/13
    ((3000.0, 410.0, 52.0), "watch"),   # 19/16/13
    ((6000.0, 410.0, 52.0), "act"),     # 20/16/13
    ((600.0, 150.0, 20.0), "ok"),       # 16/14/11, cleaner than target
])
def test_tool_verdict_against_target(counts, level):
    c4, c6, c14 = counts
    assert _iso(count4=c4, count6=c6, count14=c14).level == level


def test_tool_from_a_code_with_a_missing_size():
    result = _iso(source="code", scale4=None, scale6=17.0, scale14=13.0)
    assert result.values["code"] == "-/17/13"
    assert result.values["low4"] is None
    assert (result.values["low6"], result.values["high6"]) == (640.0, 1300.0)
    assert result.values["excess"] == "+1" and result.level == "watch"


def test_tool_own_target_and_errors():
    result = _iso(target4=19.0, target6=17.0, target14=14.0)
    assert result.values["target_code"] == "19/17/14" and result.values["excess"] == "-1"
    with pytest.raises(InputError) as err:
        _iso(source="code")
    assert err.value.field == "scale6"
    with pytest.raises(InputError) as err:
        _iso(source="code", scale6=16.5, scale14=13.0)
    assert err.value.field == "scale6"


def test_bridge_runs_iso_4406_with_typed_numbers():
    answer = bridge.run("iso-4406", {"count4": "2 100", "count6": "480,5", "count14": "60"}, examples=True)
    assert answer["ok"] and answer["values"]["code"] == "18/16/13"


def test_code_typed_while_starting_from_counts_is_flagged():
    result = _iso(scale6=20.0, scale14=15.0)
    assert result.values["code"] == "18/16/13"
    assert any("not used" in n.template for n in result.notes)
