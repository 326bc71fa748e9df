-- The HTML view of an issued document, rendered from the same report model at the same moment as its PDF, so that
-- a reader can read the report in the browser. The PDF stays the issued document (its SHA-256 is what verification
-- accepts); this is its companion. Append-only like the document itself.

CREATE TABLE issued_document_html (
    document_id  bigint PRIMARY KEY REFERENCES issued_document (id),
    html         text   NOT NULL
);

REVOKE UPDATE, DELETE, TRUNCATE ON issued_document_html FROM ${appRole};
CREATE TRIGGER issued_document_html_is_append_only BEFORE UPDATE OR DELETE ON issued_document_html
    FOR EACH ROW EXECUTE FUNCTION refuse_change_of_append_only_row();
