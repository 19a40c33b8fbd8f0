import postgres from 'postgres';

/**
 * The recipient's side of the local mail catcher: what it received, read from its table. The
 * administrators' screen hides the tokens in links, so a test that acts as the recipient reads
 * its link here, as the person would in their own inbox.
 */
export async function latestMailBodyTo(address: string): Promise<string | undefined> {
  const url = process.env['DATABASE_URL'];
  if (!url) throw new Error('Browser tests that read mail need DATABASE_URL (the test command sets it)');
  const sql = postgres(url, { max: 1, onnotice: () => undefined });
  try {
    const rows = await sql<{ text_body: string }[]>`
      select text_body from captured_mail where to_address = ${address} order by received_at desc limit 1`;
    return rows[0]?.text_body;
  } finally {
    await sql.end({ timeout: 5 });
  }
}
