// The Catch2 main, kept in its own translation unit because it compiles slowly.
#define CATCH_CONFIG_MAIN
#include <catch2/catch.hpp>
