#pragma once
// A deliberate wrong-way include: the layer check must refuse this tree.
#include "app/registry/lab.hpp"
