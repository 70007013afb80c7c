import { route, type ApiRouter } from '../../http/route';
import { requestEm } from '../../db';
import { uuidParam } from '../../../shared/schemas/common';
import {
  purchaseListQuery,
  purchaseReceiptInputSchema,
  purchaseRequestInputSchema,
  suggestionQuery,
  supplierInputSchema,
} from '../../../shared/schemas/purchasing';
import { createSupplier, listRequests, listSuppliers, moveRequest, raiseRequest, receive } from './purchasing.service';
import { suggestedOrders, suggestionsCsv } from './suggestions.service';

export function registerPurchasingRoutes(r: ApiRouter) {
  route(r, 'get', '/suppliers', { access: 'purchasing.read' }, async (_req, res) => {
    res.json(await listSuppliers(requestEm()));
  });
  route(r, 'post', '/suppliers', { access: 'purchasing.suppliers', body: supplierInputSchema }, async (_req, res, { body, principal }) => {
    res.status(201).json(await createSupplier(requestEm(), principal, body));
  });
  route(r, 'get', '/purchase-requests', { access: 'purchasing.read', query: purchaseListQuery }, async (_req, res, { query }) => {
    res.json(await listRequests(requestEm(), query.status));
  });
  route(r, 'post', '/purchase-requests', { access: 'purchasing.request', body: purchaseRequestInputSchema }, async (_req, res, { body, principal }) => {
    res.status(201).json(await raiseRequest(requestEm(), principal, body));
  });
  route(r, 'post', '/purchase-requests/:id/approve', { access: 'purchasing.approve', params: uuidParam }, async (_req, res, { params, principal }) => {
    await moveRequest(requestEm(), principal, params.id, 'approve');
    res.json({ ok: true });
  });
  route(r, 'post', '/purchase-requests/:id/order', { access: 'purchasing.order', params: uuidParam }, async (_req, res, { params, principal }) => {
    await moveRequest(requestEm(), principal, params.id, 'order');
    res.json({ ok: true });
  });
  route(r, 'post', '/purchase-requests/:id/cancel', { access: 'purchasing.approve', params: uuidParam }, async (_req, res, { params, principal }) => {
    await moveRequest(requestEm(), principal, params.id, 'cancel');
    res.json({ ok: true });
  });
  route(
    r,
    'post',
    '/purchase-requests/:id/receipts',
    { access: 'purchasing.receive', params: uuidParam, body: purchaseReceiptInputSchema },
    async (_req, res, { params, body, principal }) => {
      res.status(201).json(await receive(requestEm(), principal, params.id, body));
    },
  );
  route(r, 'get', '/purchasing/suggestions', { access: 'purchasing.read', query: suggestionQuery }, async (_req, res, { query, principal }) => {
    res.json(await suggestedOrders(requestEm(), principal, query.weeks));
  });
  route(r, 'get', '/purchasing/suggestions.csv', { access: 'purchasing.read', query: suggestionQuery }, async (_req, res, { query, principal }) => {
    const csv = suggestionsCsv(await suggestedOrders(requestEm(), principal, query.weeks));
    res.type('text/csv; charset=utf-8').attachment(`order-suggestions-${query.weeks}-weeks.csv`).send(csv);
  });
}
