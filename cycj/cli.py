"""The ``cycj`` command line: thin wrappers; every command is a call into the modules.

Commands are loaded lazily (``cycj --help`` does not import numpy, pandas or numba).  Input
errors end with one line on stderr and exit status 2, never a traceback.
"""

from __future__ import annotations

import importlib
import os
import sys

import click

#: command name → "module:function" (each module lives in cycj/commands/)
COMMANDS = {
    "check": "cycj.commands.check:check",
    "count": "cycj.commands.count:count",
    "demo": "cycj.commands.demo:demo",
    "geometries": "cycj.commands.check:geometries",
    "j-table": "cycj.commands.jtable:j_table",
    "keys": "cycj.commands.keys:keys",
    "new": "cycj.commands.keys:new",
    "plan": "cycj.commands.plan:plan",
    "pod": "cycj.commands.pod:pod",
    "run": "cycj.commands.run:run",
    "fit": "cycj.commands.fit:fit",
}


class LazyGroup(click.Group):
    def list_commands(self, ctx):
        return sorted(COMMANDS)

    def get_command(self, ctx, name):
        if name not in COMMANDS:
            return None
        module, attr = COMMANDS[name].split(":")
        return getattr(importlib.import_module(module), attr)


def _version() -> str:
    from cycj._version import __version__

    return __version__


@click.group(cls=LazyGroup, context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(_version(), prog_name="cycj")
def cli():
    """cycj: fatigue crack growth life driven by the cyclic J-integral (ΔJ).

    Estimates for engineering judgement: they do not replace the applicable design code,
    fitness-for-service standard or a qualified engineer's review.
    """


def main(argv=None):
    """Entry point: run the group and turn input errors into one line and exit status 2."""
    from cycj.errors import CycjInputError, ValidityRangeError
    from cycj.inputs_read import forget_inputs

    forget_inputs()  # a new command: the inputs it reads are noted afresh
    # one line on stderr when the kernels are really compiled (cycj._jit reads it on import)
    os.environ.setdefault("CYCJ_COMPILE_NOTICE", "1")
    # no docstrings for matplotlib's artists when cycj.life.plots imports it: none is read
    os.environ.setdefault("CYCJ_COMMAND_LINE", "1")
    try:
        rv = cli.main(args=argv, prog_name="cycj", standalone_mode=False)
        from cycj import _ahead

        _ahead.save_if_asked(lambda line: click.echo(line, err=True))
    except click.exceptions.Abort:
        click.echo("cycj: stopped by the user", err=True)
        sys.exit(130)
    except click.ClickException as exc:
        exc.show()
        sys.exit(2)
    except (CycjInputError, ValidityRangeError) as exc:
        click.echo(f"cycj: error: {exc}", err=True)
        sys.exit(2)
    except KeyboardInterrupt as exc:
        where = f": {exc}" if str(exc) else ""
        click.echo(
            f"cycj: stopped by the user (Ctrl-C){where}; no partial outputs were kept", err=True
        )
        sys.exit(130)
    except (OSError, UnicodeDecodeError) as exc:
        click.echo(f"cycj: error: {exc}", err=True)
        sys.exit(2)
    except Exception as exc:  # noqa: BLE001 - a bug: one line, traceback on request
        if os.environ.get("CYCJ_DEBUG"):
            raise
        click.echo(
            f"cycj: internal error: {type(exc).__name__}: {exc} (set CYCJ_DEBUG=1 for "
            "the traceback, and please report it)",
            err=True,
        )
        sys.exit(1)
    sys.exit(rv if isinstance(rv, int) else 0)


if __name__ == "__main__":  # pragma: no cover
    main()
