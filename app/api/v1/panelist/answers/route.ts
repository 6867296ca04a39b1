import { otherMethods } from "@/lib/http/handler";
import { postAnswer } from "@/lib/http/answer-route";

// The handler lives in lib (the production server also calls it directly, lib/http/server.ts).
export const POST = postAnswer;
export const { GET, PUT, PATCH, DELETE } = otherMethods("POST");
