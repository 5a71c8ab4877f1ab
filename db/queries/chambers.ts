import 'server-only';
import { asc, eq } from 'drizzle-orm';
import { db, type Executor } from '../client';
import { chambers, type Chamber } from '../schema';

export async function listChambers(): Promise<Chamber[]> {
  return db().select().from(chambers).orderBy(asc(chambers.name));
}

export async function findChamberByName(name: string, ex: Executor = db()): Promise<Chamber | undefined> {
  const [row] = await ex.select().from(chambers).where(eq(chambers.name, name));
  return row;
}

export async function findChamberById(id: number, ex: Executor = db()): Promise<Chamber | undefined> {
  const [row] = await ex.select().from(chambers).where(eq(chambers.id, id));
  return row;
}
