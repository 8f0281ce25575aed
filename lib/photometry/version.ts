/** Version of the measurement definitions; bump when any reported number can change. */
export const ENGINE_VERSION = '1.2.0';
