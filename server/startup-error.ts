/**
 * One line saying why the server could not start and what to change, for the errors
 * people actually meet: a database that cannot be reached, a DATA_DIR that cannot be
 * written, a port already taken. Anything else: its message on one line.
 */
export function startupErrorLine(error: unknown, env: NodeJS.ProcessEnv): string {
  const e = (error ?? {}) as NodeJS.ErrnoException & { address?: string; port?: number };
  const message = oneLine(error instanceof Error ? error.message : String(error));
  if (e.code === 'EADDRINUSE' || e.code === 'EACCES' && e.syscall === 'listen') {
    const where = `${e.address ?? env.HOST ?? '127.0.0.1'}:${e.port ?? env.PORT ?? 3000}`;
    return e.code === 'EADDRINUSE'
      ? `port ${where} is already in use: stop the program using it or set PORT to a free port.`
      : `not allowed to listen on ${where}: choose a PORT above 1023 or run with the needed rights.`;
  }
  if (e.path && e.syscall && ['EACCES', 'EPERM', 'ENOTDIR', 'EROFS', 'ENOSPC', 'EEXIST', 'ENOENT', 'EISDIR'].includes(e.code ?? '')) {
    return `DATA_DIR ${env.DATA_DIR ?? './data'} cannot be used (${e.code} on ${e.path}): point DATA_DIR at a folder this user can write. (${message})`;
  }
  if (env.DATABASE_URL && isDatabaseError(e)) {
    return `cannot open the database at ${redact(env.DATABASE_URL)}: ${message}. Check DATABASE_URL and that the server is running.`;
  }
  return message;
}

const NETWORK_CODES = ['ECONNREFUSED', 'ENOTFOUND', 'ETIMEDOUT', 'EHOSTUNREACH', 'ECONNRESET', 'EAI_AGAIN'];

function isDatabaseError(e: { code?: string }): boolean {
  // PostgreSQL SQLSTATE codes: 28xxx authentication, 3D000 unknown database, 08xxx connection.
  return NETWORK_CODES.includes(e.code ?? '') || /^(28|3D|08)[0-9A-Z]{3}$/.test(e.code ?? '');
}

/** The URL without its password. */
function redact(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return '(unparsable URL)';
  }
}

function oneLine(text: string): string {
  return text.replace(/\s*\n\s*/g, '; ').trim();
}
