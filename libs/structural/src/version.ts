/**
 * The engine's version, stored beside every result the server computes so that a report or a
 * review shows which engine checked a scheme. Raise it whenever a change alters any result.
 */
export const ENGINE_VERSION = '0.1.2';
