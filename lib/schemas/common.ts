import { z } from 'zod';

export const uuidSchema = z.string().uuid({ message: 'Not a valid id' });
