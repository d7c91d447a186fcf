"""``oddsbench sweep``: a grid solved exactly, the same on this process, local processes and Dask."""

import csv
import io
import json
from pathlib import Path

from oddsbench.cli.main import main
from oddsbench.core.sweeps import solve_task
from oddsbench.model.numbers import QQ, parse_fraction
from oddsbench.report.cautions import CAUTIONS
from oddsbench.report.sweep_report import sweep_json
from oddsbench.sweep import runners
from oddsbench.sweep.spec import read_sweep_spec


def run_sweep(spec, workers: int):
    """Every point on the chosen runner, each solved by the core's per-point function."""
    return runners.run_sweep(spec, solve_task, workers=workers)


ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "examples" / "wheel-payout-sweep.toml"
WHEEL = ROOT / "rulesets" / "single-zero-wheel.toml"


def write_spec(tmp_path, body: str, name: str = "spec.toml") -> Path:
    path = tmp_path / name
    path.write_text(f'[sweep]\nruleset = "{WHEEL}"\n' + body)
    return path


def test_the_example_grid_has_100_points_with_exact_edges():
    spec = read_sweep_spec(EXAMPLE)
    result = run_sweep(spec, workers=1)
    assert len(result.points) == 100 and not result.errors
    for point, solved in zip(result.points, result.results):
        settings = dict(point.settings)
        pockets, payout = parse_fraction(settings["pockets"]), parse_fraction(settings["payout"])
        edge = dict((name, exact) for name, exact, _ in solved.figures)["house_edge"]
        # one pocket paying `payout` to 1 with chance 1/pockets: edge 1 - (payout + 1) / pockets (arithmetic)
        assert settings["pockets_won"] == "1"
        assert parse_fraction(edge) == 1 - (payout + 1) / pockets
        assert solved.exact


def test_local_processes_give_the_same_figures_as_this_process():
    spec = read_sweep_spec(EXAMPLE)
    here = sweep_json(run_sweep(spec, workers=1))
    pooled = sweep_json(run_sweep(spec, workers=2))
    assert pooled["points"] == here["points"]
    assert pooled["sweep"]["runner"] == "2 local processes"


def test_a_local_dask_cluster_gives_identical_results(tmp_path):
    import distributed  # a test dependency (the test extras): a missing one fails here, never skips

    local = tmp_path / "local.json"
    remote = tmp_path / "cluster.json"
    assert main(["sweep", str(EXAMPLE), "--workers", "2", "--json", str(local), "--no-progress"]) == 0
    with distributed.LocalCluster(
        n_workers=1,
        threads_per_worker=2,
        processes=False,
        protocol="tcp",
        host="127.0.0.1",
        scheduler_port=0,
        dashboard_address=":0",  # None does not turn the dashboard off (dask/distributed issue 8136)
    ) as cluster:
        address = cluster.scheduler_address
        assert address.startswith("tcp://127.0.0.1:")
        args = ["sweep", str(EXAMPLE), "--cluster", address, "--json", str(remote), "--no-progress"]
        assert main(args) == 0
    on_cluster, at_home = json.loads(remote.read_text()), json.loads(local.read_text())
    assert len(on_cluster["points"]) == 100
    assert on_cluster["points"] == at_home["points"]
    assert on_cluster["sweep"]["runner"].startswith(f"Dask cluster {address}")


def test_csv_has_one_row_per_point_and_the_cautions(tmp_path, capsys):
    spec = write_spec(tmp_path, "[params]\npockets_won = [1]\npayout = [34, 35, 36]\n")
    target = tmp_path / "out.csv"
    assert main(["sweep", str(spec), "--csv", str(target), "--no-progress"]) == 0
    rows = list(csv.reader(io.StringIO(target.read_text())))
    header, body = rows[0], rows[1:]
    points = [dict(zip(header, row)) for row in body if row[0] != "caution"]
    assert [p["payout"] for p in points] == ["34", "35", "36"]
    # straight-up payouts 34, 35, 36 on 37 pockets: edges 2/37, 1/37, 0 (arithmetic)
    assert [p["house_edge exact"] for p in points] == ["2/37", "1/37", "0"]
    assert [row[1] for row in body if row[0] == "caution"] == list(CAUTIONS)
    out = capsys.readouterr().out
    assert "1/37" in out and CAUTIONS[0] in out


def test_a_range_is_exact_and_inclusive(tmp_path):
    spec = read_sweep_spec(write_spec(tmp_path, '[params]\npayout = { from = 35, to = 36, step = "1/4" }\n'))
    assert spec.axes[0].values == (QQ(35), QQ(141, 4), QQ(71, 2), QQ(143, 4), QQ(36))


def test_a_float_value_is_refused_with_its_place(tmp_path, capsys):
    spec = write_spec(tmp_path, "[params]\npayout = [35, 35.5]\n")
    assert main(["sweep", str(spec)]) == 2
    assert "spec.toml: [params], payout, value 2: write decimals in quotes" in capsys.readouterr().err


def test_an_unknown_parameter_is_refused_before_solving(tmp_path, capsys):
    spec = write_spec(tmp_path, "[params]\ncolour = [1, 2]\n")
    assert main(["sweep", str(spec), "--no-progress"]) == 2
    assert "param 'colour': cannot be set" in capsys.readouterr().err


def test_a_failing_point_is_named_and_no_file_is_written(tmp_path, capsys):
    spec = write_spec(tmp_path, '[params]\npockets = [37, "1/2"]\n')
    target = tmp_path / "out.json"
    assert main(["sweep", str(spec), "--json", str(target), "--workers", "1", "--no-progress"]) == 2
    err = capsys.readouterr().err
    assert "point 1 (pockets=1/2)" in err and "no files written" in err
    assert not target.exists()


def test_an_existing_output_is_kept_without_force(tmp_path, capsys):
    spec = write_spec(tmp_path, "[params]\npayout = [35]\n")
    target = tmp_path / "out.json"
    target.write_text("keep")
    assert main(["sweep", str(spec), "--json", str(target), "--no-progress"]) == 2
    assert target.read_text() == "keep" and "already exists" in capsys.readouterr().err


def test_an_unknown_figure_name_lists_the_known_ones(tmp_path, capsys):
    spec = write_spec(tmp_path, "[params]\npayout = [35]\n", name="s.toml")
    spec.write_text(spec.read_text().replace("[params]", 'figures = ["edge"]\n[params]'))
    assert main(["sweep", str(spec), "--no-progress"]) == 2
    assert "unknown 'edge' (known: expected_net" in capsys.readouterr().err


def test_a_missing_ruleset_names_the_spec_field(tmp_path, capsys):
    spec = tmp_path / "spec.toml"
    spec.write_text('[sweep]\nruleset = "nowhere.toml"\n')
    assert main(["sweep", str(spec)]) == 2
    assert "spec.toml: [sweep], ruleset: 'nowhere.toml': no such file" in capsys.readouterr().err


def test_a_strategy_axis_solves_each_named_strategy(tmp_path, choice_game):
    spec = tmp_path / "spec.toml"
    spec.write_text(f'[sweep]\nruleset = "{choice_game}"\nstrategy = ["eager", "careful"]\n')
    result = run_sweep(read_sweep_spec(spec), workers=1)
    edges = {
        dict(p.settings)["strategy"]: dict((n, e) for n, e, _ in r.figures)["house_edge"]
        for p, r in zip(result.points, result.results)
    }
    # eager: edge -1/3, careful: 0 (arithmetic, as in the report test)
    assert edges == {"eager": "-1/3", "careful": "0"}


def test_a_malformed_cluster_address_is_one_line_before_connecting(capsys):
    assert main(["sweep", str(EXAMPLE), "--cluster", "foo://x", "--no-progress"]) == 2
    err = capsys.readouterr().err
    assert "--cluster 'foo://x': expected a scheduler address such as tcp://" in err
    assert len(err.strip().splitlines()) == 1


def test_session_settings_and_plans_are_axes_with_session_figures(tmp_path):
    spec = write_spec(
        tmp_path,
        '[params]\npayout = [1, "11/10"]\n[session]\nbankroll = [5, 10]\ngoal = 20\nplan = ["flat:1", "bold"]\n',
    )
    spec.write_text(spec.read_text().replace("[params]", 'figures = ["session.goal_probability"]\n[params]'))
    read = read_sweep_spec(spec)
    assert [axis.label for axis in read.axes] == ["payout", "session.bankroll", "session.goal", "plan"]
    here = run_sweep(read, workers=1)
    pooled = run_sweep(read, workers=2)
    assert sweep_json(here)["points"] == sweep_json(pooled)["points"] and not here.errors
    goal = {
        tuple(v for _, v in p.settings): dict((n, e) for n, e, _ in r.figures)["session.goal_probability"]
        for p, r in zip(here.points, here.results)
    }
    # bold play from 10 to 20 at even money is one spin: 18/37 (Dubins and Savage; arithmetic)
    assert goal[("1", "10", "20", "bold")] == "18/37"
    # from 5 to 20 bold at even money: two wins in a row, (18/37)^2 = 324/1369 (arithmetic)
    assert goal[("1", "5", "20", "bold")] == "324/1369"


def test_an_unknown_session_setting_or_plan_is_refused(tmp_path, capsys):
    spec = write_spec(tmp_path, '[session]\nbankroll = [5]\ngoal = 10\nstyle = 1\nplan = ["double"]\n')
    assert main(["sweep", str(spec)]) == 2
    err = capsys.readouterr().err
    assert "[session], style: unknown setting" in err and "[session], plan: plan 'double': unknown plan" in err
