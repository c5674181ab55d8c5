// `corelag user add|list|set-role|set-password|disable|enable`: accounts from a shell (the first administrator when
// CORELAG_DEMO=0, or when the web page is out of reach). Every change is audited as `cli:<os user>`.
import { readFileSync } from "node:fs";
import { parseArgs } from "node:util";
import { CliError, currentCliActor } from "../common";

const USER_USAGE = "usage: corelag user add --email E --name N --role admin|reviewer|designer|auditor --password-stdin | user list | user set-role --email E --role R | user set-password --email E --password-stdin | user disable --email E | user enable --email E";

/** The password from standard input: its first line, without the line end (so `echo pw |` works). */
function passwordFromStdin(): string {
  const text = readFileSync(0, "utf8");
  return text.split(/\r?\n/)[0] ?? "";
}

const shown = (u: { id: string; email: string; name: string; role: string; disabled: boolean; demo: boolean; createdAt: Date }) => ({
  id: u.id, email: u.email, name: u.name, role: u.role, disabled: u.disabled, demo: u.demo, created_at: u.createdAt.toISOString(),
});

export async function userCommand(argv: string[]): Promise<unknown> {
  const [sub, ...rest] = argv;
  const svc = await import("../../services/users");
  const actor = currentCliActor();
  switch (sub) {
    case "add": {
      const { values } = parseArgs({ args: rest, options: { email: { type: "string" }, name: { type: "string" }, role: { type: "string" }, "password-stdin": { type: "boolean" } }, strict: true });
      for (const f of ["email", "name", "role"] as const) if (!values[f]) throw new CliError(`--${f} is required (${USER_USAGE})`);
      if (!values["password-stdin"]) throw new CliError("--password-stdin is required: the password is read from standard input, never from the command line (it would show in the process list and shell history)");
      const res = await svc.addUser({ email: values.email!, name: values.name!, role: values.role!, password: passwordFromStdin() }, actor);
      if (!res.ok) throw new CliError(res.reason === "invalid" ? `--${res.field === "password" ? "password-stdin" : res.field}: ${res.message}` : res.message);
      return shown(res.user);
    }
    case "list": {
      parseArgs({ args: rest, options: {}, strict: true });
      return (await svc.users()).map(shown);
    }
    case "set-role": {
      const { values } = parseArgs({ args: rest, options: { email: { type: "string" }, role: { type: "string" } }, strict: true });
      if (!values.email || !values.role) throw new CliError(`--email and --role are required (${USER_USAGE})`);
      const res = await svc.changeRole(values.email, values.role, actor);
      if (!res.ok) throw new CliError(res.reason === "invalid" ? `--role: ${res.message}` : res.message);
      return shown(res.user);
    }
    case "set-password": {
      const { values } = parseArgs({ args: rest, options: { email: { type: "string" }, "password-stdin": { type: "boolean" } }, strict: true });
      if (!values.email) throw new CliError(`--email is required (${USER_USAGE})`);
      if (!values["password-stdin"]) throw new CliError("--password-stdin is required: the password is read from standard input, never from the command line (it would show in the process list and shell history)");
      const res = await svc.resetPassword(values.email, passwordFromStdin(), actor);
      if (!res.ok) throw new CliError(res.reason === "invalid" ? `--password-stdin: ${res.message}` : res.message);
      return shown(res.user);
    }
    case "disable":
    case "enable": {
      const { values } = parseArgs({ args: rest, options: { email: { type: "string" } }, strict: true });
      if (!values.email) throw new CliError(`--email is required (${USER_USAGE})`);
      const res = await svc.changeDisabled(values.email, sub === "disable", actor);
      if (!res.ok) throw new CliError(res.message);
      return shown(res.user);
    }
    default:
      throw new CliError(`${sub ? `unknown subcommand '${sub}'` : "no subcommand given"}; ${USER_USAGE}`);
  }
}
