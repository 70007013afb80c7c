import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { uuidParam } from '../../../shared/schemas/common';
import { listPartTypesQuery, partTypeInputSchema, partTypeUpdateSchema, recordStockMoveSchema } from '../../../shared/schemas/stock';
import { createPartType, getPartType, listMoves, listPartTypes, recordStockMove, updatePartType } from './part-types.service';
import { paging } from '../../../shared/schemas/paging';

export function registerStockRoutes(r: ApiRouter) {
  route(r, 'get', '/part-types', { access: 'stock.read', query: listPartTypesQuery }, async (_req, res, { query, principal: who }) => {
    res.json(await listPartTypes(requestEm(), who, query));
  });
  route(r, 'post', '/part-types', { access: 'stock.manage', body: partTypeInputSchema }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await createPartType(requestEm(), who, body));
  });
  route(r, 'get', '/part-types/:id', { access: 'stock.read', params: uuidParam }, async (_req, res, { params, principal: who }) => {
    res.json(await getPartType(requestEm(), who, params.id));
  });
  route(
    r,
    'patch',
    '/part-types/:id',
    { access: 'stock.manage', params: uuidParam, body: partTypeUpdateSchema },
    async (_req, res, { params, body, principal: who }) => {
      await updatePartType(requestEm(), who, params.id, body);
      res.json({ ok: true });
    },
  );
  route(r, 'get', '/part-types/:id/moves', { access: 'stock.read', params: uuidParam, query: paging }, async (_req, res, { params, query }) => {
    res.json(await listMoves(requestEm(), params.id, query));
  });
  route(r, 'post', '/stock-moves', { access: 'stock.manage', body: recordStockMoveSchema }, async (_req, res, { body, principal: who }) => {
    res.status(201).json(await recordStockMove(requestEm(), who, body));
  });
}
