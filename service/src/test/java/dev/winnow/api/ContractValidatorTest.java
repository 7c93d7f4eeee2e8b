package dev.winnow.api;

import com.fasterxml.jackson.databind.JsonNode;
import org.junit.jupiter.api.Test;

import java.net.URI;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * openapi.yaml closes every object schema, and the validator that {@link TestServer} applies to every answer tells
 * conforming answers from departing ones (checked here on a small document, so that the checks cannot pass vacuously).
 */
class ContractValidatorTest {
    private static final JsonNode SMALL = ContractValidator.readYaml("""
            openapi: 3.1.0
            paths:
              /v1/things/{thing}:
                get:
                  responses:
                    '200':
                      content:
                        application/json:
                          schema:
                            $ref: '#/components/schemas/Thing'
                    '304':
                      description: no body
                    4XX:
                      $ref: '#/components/responses/Problem'
              /v1/things/count:
                get:
                  responses:
                    '200':
                      content:
                        text/csv:
                          schema:
                            type: string
            components:
              responses:
                Problem:
                  content:
                    application/problem+json:
                      schema:
                        $ref: '#/components/schemas/Problem'
              schemas:
                Thing:
                  type: object
                  additionalProperties: false
                  required: [name, size]
                  properties:
                    name:
                      type: string
                    size:
                      type: [number, 'null']
                Problem:
                  type: object
                  required: [status, detail]
                  properties:
                    status:
                      type: integer
                    detail:
                      type: string
            """);
    private static final ContractValidator V = ContractValidator.of(SMALL);

    private static List<String> get(String path, int status, String type, String body) {
        return V.problems("GET", URI.create("http://h" + path), status, type, body);
    }

    @Test
    void theRepositoryDocumentClosesEveryObjectSchema() {
        assertEquals(List.of(), ContractValidator.shared().openObjectSchemas(),
                "object schemas of openapi.yaml without additionalProperties (false, or a schema for maps)");
    }

    @Test
    void theSmallDocumentHasAnOpenSchema() {
        assertEquals(List.of("#/components/schemas/Problem"), V.openObjectSchemas());
    }

    @Test
    void aConformingAnswerPasses() {
        assertEquals(List.of(), get("/v1/things/a", 200, "application/json", "{\"name\":\"a\",\"size\":null}"));
        assertEquals(List.of(), get("/v1/things/a", 304, null, ""));
        assertEquals(List.of(), get("/v1/things/a", 404, "application/problem+json", "{\"status\":404,\"detail\":\"no\"}"));
        assertEquals(List.of(), get("/v1/things/count", 200, "text/csv; charset=utf-8", "n\n3\n"), "literal segments win");
    }

    @Test
    void anExtraOrMissingFieldFails() {
        assertEquals(1, get("/v1/things/a", 200, "application/json", "{\"name\":\"a\",\"size\":1,\"colour\":\"red\"}").size());
        assertEquals(1, get("/v1/things/a", 200, "application/json", "{\"name\":\"a\"}").size());
        assertEquals(1, get("/v1/things/a", 200, "application/json", "{\"name\":\"a\",\"size\":\"big\"}").size());
    }

    @Test
    void anUndocumentedStatusTypeOrBodyFails() {
        assertTrue(get("/v1/things/a", 500, "application/problem+json", "{\"status\":500,\"detail\":\"x\"}").get(0).contains("does not list"));
        assertTrue(get("/v1/things/a", 200, "text/csv", "a\n").get(0).contains("content type"));
        assertTrue(get("/v1/things/a", 304, null, "{}").get(0).contains("describes none"));
        assertTrue(get("/v1/things/a", 200, "application/json", "not json").get(0).contains("not JSON"));
    }

    @Test
    void unknownPathsAndMethodsMustBeProblems() {
        assertEquals(List.of(), get("/v1/nothing", 404, "application/problem+json", "{\"status\":404,\"detail\":\"no\"}"));
        assertEquals(1, get("/v1/nothing", 200, "application/json", "{}").size());
        assertEquals(List.of(), V.problems("POST", URI.create("http://h/v1/things/a"), 405, "application/problem+json",
                "{\"status\":405,\"detail\":\"no\"}"));
        assertEquals(1, V.problems("POST", URI.create("http://h/v1/things/a"), 201, "application/json", "{}").size());
    }
}
