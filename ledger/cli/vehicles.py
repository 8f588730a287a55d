"""``wbledger vehicle …``: add, list and show vehicles."""

from __future__ import annotations

import typer

from ledger.cli import common

vehicle_app = typer.Typer(help="Vehicles: registrations of an imported type.",
                          no_args_is_help=True)


def register(app: typer.Typer) -> None:
    app.add_typer(vehicle_app, name="vehicle")


@vehicle_app.command("add")
def add(ctx: typer.Context,
        registration: str = typer.Argument(..., metavar="REG", help="Registration or fleet id."),
        type_name: str = typer.Option(..., "--type", help="Name of an imported type."),
        serial: str = typer.Option(None, "--serial", help="Serial number."),
        note: str = typer.Option(None, "--note", help="Free text."),
        ) -> None:
    """Add a vehicle of an imported type."""
    from ledger.services.fleet import add_vehicle

    add_vehicle(common.state(ctx).engine(), registration, type_name, serial=serial, note=note)
    typer.echo(f"Added {registration} ({type_name}); next, its first weighing: "
               f"`wbledger weigh {registration}`.")


@vehicle_app.command("list")
def list_(ctx: typer.Context, as_json: bool = common.JSON_OPTION) -> None:
    """The fleet: each vehicle's current empty mass and CG, last weighing and warnings."""
    from ledger.report.ledger import render_fleet
    from ledger.services.fleet import fleet

    data = fleet(common.state(ctx).engine())
    common.emit(data, render_fleet, as_json)


@vehicle_app.command("show")
def show(ctx: typer.Context, registration: str = typer.Argument(..., metavar="REG"),
         as_json: bool = common.JSON_OPTION) -> None:
    """One vehicle: its type, current empty mass and CG, and last entries."""
    from ledger.report.ledger import render_vehicle
    from ledger.services.fleet import vehicle

    data = vehicle(common.state(ctx).engine(), registration)
    common.emit(data, render_vehicle, as_json)
