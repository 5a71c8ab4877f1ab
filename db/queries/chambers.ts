import 'server-only';
import { asc } from 'drizzle-orm';
import { db } from '../client';
import { chambers, type Chamber } from '../schema';

export async function listChambers(): Promise<Chamber[]> {
  return db().select().from(chambers).orderBy(asc(chambers.name));
}
