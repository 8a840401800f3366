import { eq } from 'drizzle-orm';
import type { Db, Tx } from '../db/client';
import { shopSettings } from '../db/schema';
import type { SessionUser } from '../auth/types';
import { DEFAULT_SHOP_RATES, shopRatesSchema, type ShopRates } from '~/domain/quote';
import { audit } from './audit';

const ROW_ID = 1;

/** The shop's rates; the invented defaults are stored on first use (so an admin edits a real row). */
export async function getShopRates(db: Db | Tx): Promise<{ rates: ShopRates; updatedAt: string | null; updatedById: string | null }> {
  const [row] = await db.select().from(shopSettings).where(eq(shopSettings.id, ROW_ID)).limit(1);
  if (!row) {
    await db.insert(shopSettings).ignore().values({ id: ROW_ID, rates: DEFAULT_SHOP_RATES });
    return { rates: DEFAULT_SHOP_RATES, updatedAt: null, updatedById: null };
  }
  const parsed = shopRatesSchema.safeParse(row.rates);
  // a stored document that no longer parses (older shape) falls back to the defaults, visibly
  return { rates: parsed.success ? parsed.data : DEFAULT_SHOP_RATES, updatedAt: row.updatedAt.toISOString(), updatedById: row.updatedById };
}

export async function updateShopRates(db: Db, user: SessionUser, input: unknown): Promise<ShopRates> {
  const rates = shopRatesSchema.parse(input);
  await db.transaction(async (tx) => {
    const before = await getShopRates(tx);
    await tx
      .insert(shopSettings)
      .values({ id: ROW_ID, rates, updatedById: user.id })
      .onDuplicateKeyUpdate({ set: { rates, updatedById: user.id, updatedAt: new Date() } });
    const changed = (Object.keys(rates) as (keyof ShopRates)[]).filter((k) => JSON.stringify(rates[k]) !== JSON.stringify(before.rates[k]));
    await audit(tx, user.id, 'shop.settings_updated', { type: 'shop_settings', id: ROW_ID }, { changed });
  });
  return rates;
}
