// The command that asks a balance for a reading (app/registry/balance_port): stored as typed text, sent as bytes.
#include <catch2/catch.hpp>

#include "app/registry/balance_port.hpp"

using plumb::app::command_bytes;

TEST_CASE("a send command gets CR LF unless it ends with a line end of its own", "[capture]") {
  CHECK(command_bytes("READ") == "READ\r\n");
  CHECK(command_bytes("P\\r") == "P\r");
  CHECK(command_bytes("P\\n") == "P\n");
  CHECK(command_bytes("A\\tB") == "A\tB\r\n");
  // A written-out backslash is one backslash; an unknown escape stays as typed.
  CHECK(command_bytes("A\\\\B") == "A\\B\r\n");
  CHECK(command_bytes("A\\qB") == "A\\qB\r\n");
  CHECK(command_bytes("") == "\r\n");
}
