"""``wbledger record REG``: the weight-and-balance record to file, on the terminal or as a PDF."""

from __future__ import annotations

from pathlib import Path

import typer

from ledger.cli import common


def register(app: typer.Typer) -> None:
    app.command("record")(record)


def record(ctx: typer.Context,
           registration: str = typer.Argument(..., metavar="REG",
                                              help="Registration or fleet id."),
           as_of: str = typer.Option(None, "--as-of", metavar="YYYY-MM-DD",
                                     help="The record as it stood on this date."),
           pdf: Path = typer.Option(None, "--pdf", metavar="FILE",
                                    help="Also write the record as a PDF to sign and file."),
           paper: str = typer.Option("A4", "--paper", metavar="PAPER",
                                     help="Page size of the PDF: A4 or Letter."),
           as_json: bool = common.JSON_OPTION) -> None:
    """The weight-and-balance record: weighings with their readings, every change with its
    reason, reference and signatory, the running empty mass, moment and CG, the equipment list.

    Refused, like a loading sheet, when the vehicle's ledger does not verify.

    Example: wbledger record KV-101 --pdf kv101-record.pdf
    """
    from ledger.report.record import render_record
    from ledger.services.record import maintenance_record

    if pdf is not None:  # a bad path or paper is refused before anything is printed
        from ledger.files import check_output_path
        from ledger.report.record_pdf import check_paper

        check_output_path(pdf, "--pdf")
        check_paper(paper)
    rec = maintenance_record(common.state(ctx).engine(), registration, as_of=as_of)
    common.emit(rec.to_dict(), lambda _doc: render_record(rec), as_json)
    if pdf is not None:
        from ledger.report.record_pdf import write_record_pdf

        typer.echo(f"Wrote PDF: {write_record_pdf(rec, pdf, paper=paper)}", err=True)
