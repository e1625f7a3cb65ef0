import { randomUUID } from 'node:crypto';
import { Router } from 'express';
import { UniqueConstraintError } from 'sequelize';
import { instrumentInputSchema, type InstrumentInput } from '../../../shared/schemas/instruments';
import type { AppContext } from '../../app-context';
import { authenticate, authorize } from '../../auth/middleware';
import { conflict, notFound } from '../../http/errors';
import { validateBody } from '../../http/validate';
import { Instrument } from '../../models';
import { presentInstrument } from '../../presenters/instrument';

function duplicateSerial(error: unknown, serialNumber: string): never {
  if (error instanceof UniqueConstraintError) {
    throw conflict(`An instrument with serial number ${serialNumber} is already listed`, { serialNumber: 'already listed' });
  }
  throw error;
}

export function instrumentsRouter(context: AppContext): Router {
  const router = Router();
  router.use(authenticate(context.sessions));

  router.get('/', async (_request, response) => {
    const instruments = await Instrument.findAll({ order: [['retired', 'ASC'], ['name', 'ASC']] });
    response.json({ instruments: instruments.map((instrument) => presentInstrument(instrument, context.now())) });
  });

  router.post('/', authorize('lead'), validateBody(instrumentInputSchema), async (request, response) => {
    const input = request.body as Required<InstrumentInput>;
    const instrument = await Instrument.create({ id: randomUUID(), ...input } as Instrument).catch((error) => duplicateSerial(error, input.serialNumber));
    response.status(201).json({ instrument: presentInstrument(instrument, context.now()) });
  });

  router.put('/:id', authorize('lead'), validateBody(instrumentInputSchema), async (request, response) => {
    const instrument = await Instrument.findByPk(String(request.params.id));
    if (!instrument) throw notFound('No such instrument');
    const input = request.body as Required<InstrumentInput>;
    await instrument.update(input).catch((error) => duplicateSerial(error, input.serialNumber));
    response.json({ instrument: presentInstrument(instrument, context.now()) });
  });

  return router;
}
