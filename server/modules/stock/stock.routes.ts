import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { requirePrincipal } from '../../http/principal';
import { uuidParam } from '../../../shared/schemas/common';
import { listPartTypesQuery, partTypeInputSchema, partTypeUpdateSchema, recordStockMoveSchema } from '../../../shared/schemas/stock';
import { createPartType, getPartType, listMoves, listPartTypes, recordStockMove, updatePartType } from './part-types.service';
import { paging } from '../../../shared/schemas/paging';

export function registerStockRoutes(r: ApiRouter) {
  route(r, 'get', '/part-types', { access: 'stock.read', query: listPartTypesQuery }, async (req, res) => {
    res.json(await listPartTypes(requestEm(), requirePrincipal(req), res.locals.query));
  });
  route(r, 'post', '/part-types', { access: 'stock.manage', body: partTypeInputSchema }, async (req, res) => {
    res.status(201).json(await createPartType(requestEm(), requirePrincipal(req), res.locals.body));
  });
  route(r, 'get', '/part-types/:id', { access: 'stock.read', params: uuidParam }, async (req, res) => {
    res.json(await getPartType(requestEm(), requirePrincipal(req), res.locals.params.id));
  });
  route(r, 'patch', '/part-types/:id', { access: 'stock.manage', params: uuidParam, body: partTypeUpdateSchema }, async (req, res) => {
    await updatePartType(requestEm(), requirePrincipal(req), res.locals.params.id, res.locals.body);
    res.json({ ok: true });
  });
  route(r, 'get', '/part-types/:id/moves', { access: 'stock.read', params: uuidParam, query: paging }, async (_req, res) => {
    res.json(await listMoves(requestEm(), res.locals.params.id, res.locals.query));
  });
  route(r, 'post', '/stock-moves', { access: 'stock.manage', body: recordStockMoveSchema }, async (req, res) => {
    res.status(201).json(await recordStockMove(requestEm(), requirePrincipal(req), res.locals.body));
  });
}
