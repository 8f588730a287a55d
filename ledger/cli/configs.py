"""``wbledger config …``: define, list and show configurations (groups of removable items)."""

from __future__ import annotations

import typer

from ledger.cli import common

config_app = typer.Typer(help="Configurations: named groups of removable items (seats out, "
                              "stretcher in) kept per type or per vehicle.",
                         no_args_is_help=True)

TYPE_OPTION = typer.Option(None, "--type", metavar="NAME", help="Owner: a vehicle type.")
VEHICLE_OPTION = typer.Option(None, "--vehicle", metavar="REG", help="Owner: one vehicle.")


def register(app: typer.Typer) -> None:
    app.add_typer(config_app, name="config")


@config_app.command("define")
def define(ctx: typer.Context,
           name: str = typer.Argument(..., metavar="NAME", help="Name of the configuration."),
           type_name: str = TYPE_OPTION, registration: str = VEHICLE_OPTION,
           install: list[str] = typer.Option(None, "--install",
                                             metavar="ITEM=MASS@ARM[,LAT[,VERT]]",
                                             help="An item added in this configuration."),
           remove: list[str] = typer.Option(None, "--remove",
                                            metavar="ITEM[=MASS@ARM[,LAT[,VERT]]]",
                                            help="An item taken out; ITEM alone takes its mass "
                                                 "and arms from the vehicle's ledger."),
           disable: list[str] = typer.Option(None, "--disable-station", metavar="STATION",
                                             help="A station not available in it."),
           description: str = typer.Option(None, "--description", metavar="TEXT",
                                           help="What it is for (free text)."),
           replace: bool = typer.Option(False, "--replace", help="Redefine an existing one."),
           by: str = common.BY_OPTION, as_json: bool = common.JSON_OPTION) -> None:
    """Define a configuration of a type (--type) or of one vehicle (--vehicle)."""
    from ledger.report.ledger import render_configuration
    from ledger.services.configurations import define_configuration, parse_items

    items = parse_items(install or [], remove or [])
    data = define_configuration(common.state(ctx).engine(), name, actor=common.actor(by),
                                type_name=type_name, registration=registration, items=items,
                                description=description, disables_stations=disable or [],
                                replace=replace)
    common.emit(data, render_configuration, as_json)


@config_app.command("list")
def list_(ctx: typer.Context, type_name: str = TYPE_OPTION,
          registration: str = VEHICLE_OPTION, as_json: bool = common.JSON_OPTION) -> None:
    """List configurations: of a vehicle (its type's and its own), of a type, or all."""
    from ledger.report.ledger import render_configurations
    from ledger.services.configurations import list_configurations

    data = list_configurations(common.state(ctx).engine(), type_name=type_name,
                               registration=registration)
    common.emit(data, render_configurations, as_json)


@config_app.command("show")
def show(ctx: typer.Context,
         name: str = typer.Argument(..., metavar="NAME", help="Name of the configuration."),
         type_name: str = TYPE_OPTION, registration: str = VEHICLE_OPTION,
         as_json: bool = common.JSON_OPTION) -> None:
    """Show one configuration; for a vehicle, with removed items resolved from its ledger."""
    from ledger.report.ledger import render_configuration
    from ledger.services.configurations import show_configuration

    data = show_configuration(common.state(ctx).engine(), name, type_name=type_name,
                              registration=registration)
    common.emit(data, render_configuration, as_json)
