// The per-response script nonce, handed from entry.server to the root layout.
import { createContext, useContext } from "react";

export const NonceContext = createContext<string | undefined>(undefined);
export const useNonce = () => useContext(NonceContext);
