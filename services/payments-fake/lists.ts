// The provider's list answers: its envelope, its cursors and its `created` filters, shared by
// every listable resource.
import { missing } from './errors';

type Listable = { id: string; created: number };

/** Stripe's list envelope with `limit`, `starting_after`, `ending_before`; newest first. */
export function listOf<T extends Listable>(all: T[], query: URLSearchParams, path: string) {
  const limit = Math.min(Math.max(Number(query.get('limit') ?? 10) || 10, 1), 100);
  let items = [...all].reverse(); // kept in creation order; lists go newest first
  const after = query.get('starting_after');
  const before = query.get('ending_before');
  if (after) {
    const at = items.findIndex((item) => item.id === after);
    if (at < 0) throw missing('object', after, 'starting_after');
    items = items.slice(at + 1);
  }
  if (before) {
    const at = items.findIndex((item) => item.id === before);
    if (at < 0) throw missing('object', before, 'ending_before');
    items = items.slice(Math.max(0, at - limit), at);
  }
  return { object: 'list', url: path, has_more: items.length > limit, data: items.slice(0, limit) };
}

/** created[gte]=…&created[lte]=… or created=… from a query string. */
export function createdFilter(query: URLSearchParams): (created: number) => boolean {
  const exact = query.get('created');
  const bounds = { gt: query.get('created[gt]'), gte: query.get('created[gte]'), lt: query.get('created[lt]'), lte: query.get('created[lte]') };
  return (created) =>
    (exact === null || created === Number(exact)) &&
    (bounds.gt === null || created > Number(bounds.gt)) &&
    (bounds.gte === null || created >= Number(bounds.gte)) &&
    (bounds.lt === null || created < Number(bounds.lt)) &&
    (bounds.lte === null || created <= Number(bounds.lte));
}
